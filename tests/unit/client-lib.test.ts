import { describe, expect, it } from 'vitest';
import { formatDuration, formatExact, formatRelative, toDate } from '@/lib/time';
import { navItemsFor, openablePath } from '@/components/layout/nav-items';

const SECOND = 1000;
const MINUTE = 60 * SECOND;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

describe('formatDuration', () => {
  it('when the time is under a minute, then it shows whole seconds, rounded down', () => {
    expect(formatDuration(0)).toBe('0 s');
    expect(formatDuration(999)).toBe('0 s');
    expect(formatDuration(45 * SECOND + 900)).toBe('45 s');
    expect(formatDuration(MINUTE - 1)).toBe('59 s');
  });

  it('when the time is under an hour, then it shows whole minutes and no seconds', () => {
    expect(formatDuration(MINUTE)).toBe('1 min');
    expect(formatDuration(14 * MINUTE + 59 * SECOND)).toBe('14 min');
    expect(formatDuration(HOUR - 1)).toBe('59 min');
  });

  it('when the time is under a day, then it shows hours and minutes, leaving out zero minutes', () => {
    expect(formatDuration(2 * HOUR + 14 * MINUTE + 59 * SECOND)).toBe('2 h 14 min');
    expect(formatDuration(2 * HOUR)).toBe('2 h');
    expect(formatDuration(2 * HOUR + 59 * SECOND)).toBe('2 h');
    expect(formatDuration(DAY - 1)).toBe('23 h 59 min');
  });

  it('when the time is a day or more, then it shows days and hours, leaving out zero hours', () => {
    expect(formatDuration(DAY)).toBe('1 d');
    expect(formatDuration(3 * DAY + 4 * HOUR + 59 * MINUTE)).toBe('3 d 4 h');
    expect(formatDuration(3 * DAY + 59 * MINUTE)).toBe('3 d');
    expect(formatDuration(400 * DAY)).toBe('400 d');
  });

  it('when the time is negative, then its size is shown, as for the same positive time', () => {
    expect(formatDuration(-90 * SECOND)).toBe('1 min');
    expect(formatDuration(-(2 * HOUR + 14 * MINUTE))).toBe(formatDuration(2 * HOUR + 14 * MINUTE));
  });

  it('when the time is not a finite number, then a dash stands in for it', () => {
    expect(formatDuration(Number.NaN)).toBe('—');
    expect(formatDuration(Number.POSITIVE_INFINITY)).toBe('—');
    expect(formatDuration(Number.NEGATIVE_INFINITY)).toBe('—');
  });
});

describe('formatRelative', () => {
  const now = Date.UTC(2025, 4, 14, 12, 0, 0);

  it('when the moment is within five seconds either way, then it says "just now"', () => {
    expect(formatRelative(new Date(now), now)).toBe('just now');
    expect(formatRelative(new Date(now - 4999), now)).toBe('just now');
    expect(formatRelative(new Date(now + 4999), now)).toBe('just now');
  });

  it('when the moment is in the past, then it says how long ago', () => {
    expect(formatRelative(new Date(now - 5 * SECOND), now)).toBe('5 s ago');
    expect(formatRelative(new Date(now - (2 * HOUR + 14 * MINUTE + 30 * SECOND)), now)).toBe('2 h 14 min ago');
  });

  it('when the moment is in the future, then it says how long until it', () => {
    expect(formatRelative(new Date(now + 3 * HOUR), now)).toBe('in 3 h');
    expect(formatRelative(new Date(now + 2 * DAY + 5 * HOUR), now)).toBe('in 2 d 5 h');
  });
});

describe('toDate and formatExact', () => {
  it('when given a Date, then the same Date comes back', () => {
    const date = new Date();
    expect(toDate(date)).toBe(date);
  });

  it('when given an ISO string or epoch milliseconds from the API, then they mean the same instant', () => {
    const iso = '2025-05-14T12:32:00.000Z';
    expect(toDate(iso).getTime()).toBe(Date.UTC(2025, 4, 14, 12, 32));
    expect(toDate(Date.UTC(2025, 4, 14, 12, 32)).toISOString()).toBe(iso);
  });

  it('when given something that is not a date, then an invalid Date comes back rather than an exception', () => {
    expect(Number.isNaN(toDate('not a date').getTime())).toBe(true);
  });

  it('when formatting an exact time, then the local year and minutes appear in it', () => {
    const date = new Date(2025, 4, 14, 14, 7);
    const text = formatExact(date);
    expect(text).toContain('2025');
    expect(text).toContain('07');
    expect(formatExact(new Date(date.getTime()))).toBe(text);
  });
});

describe('navItemsFor', () => {
  it('when each role asks, then the top menu lists exactly the pages that role may open, in menu order', () => {
    const member = ['/', '/board', '/report', '/my-reports'];
    expect(navItemsFor('member').map((item) => item.to)).toEqual(member);
    expect(navItemsFor('technician').map((item) => item.to)).toEqual([...member, '/queue']);
    expect(navItemsFor('manager').map((item) => item.to)).toEqual([...member, '/queue', '/analytics', '/admin/service-targets']);
    expect(navItemsFor('admin').map((item) => item.to)).toEqual([...member, '/queue', '/analytics', '/admin', '/admin/service-targets']);
  });

  it('when an administrator asks, then the pages reached from the admin hub stay out of the menu but can still be linked to', () => {
    const admin = navItemsFor('admin').map((item) => item.to);
    for (const hubPage of ['/admin/mail', '/admin/facility', '/admin/displays', '/labels']) {
      expect(admin).not.toContain(hubPage);
      expect(openablePath(hubPage, 'admin')).toBe(hubPage);
    }
  });
});

describe('openablePath', () => {
  it('when the role may open the page, then its path comes back', () => {
    expect(openablePath('/', 'member')).toBe('/');
    expect(openablePath('/labels', 'technician')).toBe('/labels');
  });

  it('when the role is below the page, then null comes back', () => {
    expect(openablePath('/admin/mail', 'manager')).toBeNull();
    expect(openablePath('/admin', 'member')).toBeNull();
  });

  it('when the path is not a menu page, then null comes back', () => {
    expect(openablePath('/no-such-page', 'admin')).toBeNull();
    // Exact paths only: a prefix of a page is not that page.
    expect(openablePath('/admin/', 'admin')).toBeNull();
  });
});
