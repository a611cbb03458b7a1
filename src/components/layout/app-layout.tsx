import { useId, useRef, useState, type ReactNode } from 'react';
import { Link, NavLink, useLocation } from 'react-router';
import { ROLE_LABELS, type Role } from '@shared/roles';
import { Button } from '@/components/ui/button';
import { navItemsFor, type NavItem } from '@/components/layout/nav-items';
import { Wordmark } from '@/components/layout/wordmark';
import { useAmberRoom } from '@/lib/amber-room';
import { cx } from '@/lib/cx';
import type { RealtimeStatus } from '@/lib/socket';
import { NoticeBell } from '@/features/notices/components/notice-bell';

export interface AppLayoutUser {
  name: string;
  role: Role;
}

export interface AppLayoutProps {
  user: AppLayoutUser;
  onSignOut: () => void;
  signingOut?: boolean;
  /** Shown under the top bar when signing out failed. */
  signOutError?: string | null;
  realtime: RealtimeStatus;
  children: ReactNode;
}

export function AppLayout({ user, onSignOut, signingOut = false, signOutError, realtime, children }: AppLayoutProps) {
  const items = navItemsFor(user.role);
  const location = useLocation();
  const menuId = useId();
  const menuButton = useRef<HTMLButtonElement>(null);
  // The menu stays open only on the page where it was opened, so following a link (or the
  // back button) closes it without an effect.
  const [menuOpenAt, setMenuOpenAt] = useState<string | null>(null);
  const menuOpen = menuOpenAt === location.pathname;

  const closeMenu = (returnFocus: boolean) => {
    setMenuOpenAt(null);
    if (returnFocus) menuButton.current?.focus();
  };

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="skip-link">
        Skip to content
      </a>

      <header className="border-b border-line bg-card amber:border-b-2 print:hidden">
        <div className="mx-auto flex h-16 max-w-7xl items-center gap-3 px-4 sm:px-6">
          <Link to="/" className="-mx-1 inline-flex min-h-11 items-center rounded-md px-1 no-underline" aria-label="Faultline, home">
            <Wordmark />
          </Link>
          <RealtimeIndicator status={realtime} />
          <div className="ml-auto">
            <NoticeBell />
          </div>

          <div className="hidden items-center gap-3 lg:flex">
            <AmberRoomToggle />
            <UserLabel user={user} />
            <Button variant="secondary" onClick={onSignOut} busy={signingOut}>
              Sign out
            </Button>
          </div>

          <button
            ref={menuButton}
            type="button"
            className="inline-flex min-h-11 min-w-11 items-center gap-2 rounded-lg border border-control px-3 text-sm font-semibold text-ink lg:hidden amber:border-2"
            aria-expanded={menuOpen}
            aria-controls={menuId}
            onClick={() => (menuOpen ? closeMenu(false) : setMenuOpenAt(location.pathname))}
          >
            <MenuIcon open={menuOpen} />
            Menu
          </button>
        </div>

        <nav aria-label="Main" className="hidden border-t border-line lg:block">
          <ul className="mx-auto flex max-w-7xl gap-1 px-4 sm:px-6">
            {items.map((item) => (
              <li key={item.to}>
                <DesktopNavLink item={item} />
              </li>
            ))}
          </ul>
        </nav>

        {menuOpen && (
          <div
            id={menuId}
            className="border-t border-line lg:hidden"
            onKeyDown={(event) => {
              if (event.key === 'Escape') closeMenu(true);
            }}
          >
            <nav aria-label="Main" className="px-2 py-2">
              <ul className="flex flex-col">
                {items.map((item) => (
                  <li key={item.to}>
                    <NavLink
                      to={item.to}
                      end
                      onClick={() => closeMenu(false)}
                      className={({ isActive }) =>
                        cx(
                          'flex min-h-12 items-center rounded-lg px-3 text-base no-underline',
                          isActive
                            ? 'bg-accent-tint font-semibold text-accent-ink amber:underline amber:decoration-4'
                            : 'text-ink hover:bg-sunken',
                        )
                      }
                    >
                      {item.label}
                    </NavLink>
                  </li>
                ))}
              </ul>
            </nav>
            <div className="flex flex-col gap-3 border-t border-line px-4 py-4">
              <UserLabel user={user} />
              <div className="flex flex-wrap gap-2">
                <AmberRoomToggle />
                <Button variant="secondary" onClick={onSignOut} busy={signingOut}>
                  Sign out
                </Button>
              </div>
            </div>
          </div>
        )}
      </header>

      {signOutError && (
        <div role="alert" className="bg-alert-danger-tint px-4 py-2 text-center text-sm font-medium text-alert-danger-ink">
          {signOutError}
        </div>
      )}

      <main
        id="main"
        tabIndex={-1}
        className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 focus:outline-none sm:px-6 sm:py-8 print:max-w-none print:p-0"
      >
        {children}
      </main>

      <footer className="border-t border-line print:hidden">
        <p className="mx-auto max-w-7xl px-4 py-4 text-xs text-muted sm:px-6">
          Faultline records and notifies. It does not replace the facility&rsquo;s alarms, emergency procedures or trained staff.
        </p>
      </footer>
    </div>
  );
}

function DesktopNavLink({ item }: { item: NavItem }) {
  return (
    <NavLink
      to={item.to}
      end
      className={({ isActive }) =>
        cx(
          'inline-flex min-h-11 items-center border-b-[3px] px-3 text-sm no-underline',
          isActive ? 'border-accent font-semibold text-ink' : 'border-transparent text-muted hover:border-line hover:text-ink',
        )
      }
    >
      {item.label}
    </NavLink>
  );
}

function UserLabel({ user }: { user: AppLayoutUser }) {
  return (
    <div className="flex min-w-0 flex-col leading-tight lg:items-end">
      <span className="truncate text-sm font-semibold text-ink">{user.name}</span>
      <span className="text-xs text-muted">{ROLE_LABELS[user.role]}</span>
    </div>
  );
}

function AmberRoomToggle() {
  const [on, setOn] = useAmberRoom();
  return (
    <button
      type="button"
      aria-pressed={on}
      onClick={() => setOn(!on)}
      title="High-contrast black and white, for rooms under yellow light"
      className={cx(
        'inline-flex min-h-11 items-center gap-2 rounded-lg border px-3 text-sm font-medium amber:border-2',
        on ? 'border-ink bg-ink text-card' : 'border-control bg-card text-ink hover:bg-sunken',
      )}
    >
      <svg viewBox="0 0 16 16" className="size-4" aria-hidden="true">
        <circle cx="8" cy="8" r="6.5" fill="none" stroke="currentColor" strokeWidth="1.5" />
        <path d="M8 1.5a6.5 6.5 0 0 1 0 13Z" fill="currentColor" />
      </svg>
      Amber room{on ? ': on' : ''}
    </button>
  );
}

const REALTIME_TEXT: Record<RealtimeStatus, string> = {
  live: 'Live',
  connecting: 'Connecting…',
  reconnecting: 'Reconnecting…',
  off: 'Not live',
};

/** Whether the screen follows changes by itself; the word carries it, the mark only helps. */
function RealtimeIndicator({ status, className }: { status: RealtimeStatus; className?: string }) {
  const live = status === 'live';
  return (
    <span
      className={cx('inline-flex items-center gap-1.5 text-xs font-medium text-muted', className)}
      title={live ? 'Changes appear here as they happen' : 'Changes will appear again once the connection is back'}
    >
      <svg viewBox="0 0 10 10" className="size-2.5" aria-hidden="true">
        <circle
          cx="5"
          cy="5"
          r="3.8"
          fill={live ? 'var(--color-state-running-mark)' : 'none'}
          stroke={live ? 'var(--color-state-running-mark)' : 'currentColor'}
          strokeWidth="1.4"
        />
      </svg>
      <span role="status">{REALTIME_TEXT[status]}</span>
    </span>
  );
}

function MenuIcon({ open }: { open: boolean }) {
  return (
    <svg viewBox="0 0 20 20" className="size-5" aria-hidden="true">
      {open ? (
        <path d="M5 5l10 10M15 5 5 15" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
      ) : (
        <path d="M3 5.5h14M3 10h14M3 14.5h14" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
      )}
    </svg>
  );
}
