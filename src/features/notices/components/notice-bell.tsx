import { useEffect, useId, useRef, useState } from 'react';
import { Link, useLocation } from 'react-router';
import { Button } from '@/components/ui/button';
import { RelativeTime } from '@/components/ui/relative-time';
import { Spinner } from '@/components/ui/spinner';
import { cx } from '@/lib/cx';
import { useNotices } from '@/features/notices/api/get-notices';
import { useMarkAllNoticesRead, useMarkNoticeRead } from '@/features/notices/api/mark-read';

const PAGE = 8;
// The API pages at most 200 notices at a time; older ones stay listed there.
const MAX = 200;

/** The bell in the top bar: unread count, and a panel with the latest notices, a page at a time. */
export function NoticeBell() {
  const [open, setOpen] = useState(false);
  const [limit, setLimit] = useState(PAGE);
  const panelId = useId();
  const wrapper = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const location = useLocation();
  const notices = useNotices({ limit, offset: 0 });
  const markRead = useMarkNoticeRead();
  const markAll = useMarkAllNoticesRead();
  const unread = notices.data?.unread ?? 0;

  // Following a link inside the panel closes it.
  const [openedAt, setOpenedAt] = useState(location.pathname);
  const shown = open && openedAt === location.pathname;

  useEffect(() => {
    if (!shown) return;
    const onPointer = (event: PointerEvent) => {
      if (wrapper.current && !wrapper.current.contains(event.target as Node)) setOpen(false);
    };
    document.addEventListener('pointerdown', onPointer);
    return () => document.removeEventListener('pointerdown', onPointer);
  }, [shown]);

  return (
    <div
      ref={wrapper}
      className="relative"
      onKeyDown={(e) => {
        if (e.key === 'Escape' && shown) {
          setOpen(false);
          button.current?.focus();
        }
      }}
    >
      <button
        ref={button}
        type="button"
        aria-expanded={shown}
        aria-controls={panelId}
        aria-label={unread > 0 ? `Notices, ${unread} unread` : 'Notices'}
        data-testid="notice-bell"
        onClick={() => {
          setOpenedAt(location.pathname);
          setOpen(!shown);
        }}
        className="relative inline-flex min-h-11 min-w-11 items-center justify-center rounded-lg border border-control bg-card text-ink hover:bg-sunken amber:border-2"
      >
        <svg viewBox="0 0 20 20" className="size-5" aria-hidden="true">
          <path
            d="M10 2.5a5 5 0 0 0-5 5v3.2L3.3 14h13.4L15 10.7V7.5a5 5 0 0 0-5-5Zm-2 13a2 2 0 0 0 4 0"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.6"
            strokeLinejoin="round"
          />
        </svg>
        {unread > 0 && (
          <span
            className="absolute -top-1.5 -right-1.5 min-w-5 rounded-full bg-danger px-1 text-center text-xs leading-5 font-bold text-on-danger tabular-nums"
            aria-hidden="true"
            data-testid="notice-count"
          >
            {unread > 99 ? '99+' : unread}
          </span>
        )}
      </button>

      {shown && (
        <div
          id={panelId}
          role="region"
          aria-label="Notices"
          className="fixed inset-x-4 top-16 z-40 rounded-xl sm:absolute sm:inset-x-auto sm:top-auto sm:right-0 sm:mt-2 sm:w-96 border border-line bg-card shadow-lg amber:border-2"
        >
          <div className="flex items-center justify-between gap-2 border-b border-line px-4 py-2">
            <h2 className="font-semibold text-ink">Notices</h2>
            <Button variant="ghost" disabled={unread === 0} busy={markAll.isPending} onClick={() => markAll.mutate()}>
              Mark all read
            </Button>
          </div>
          {notices.isPending && (
            <div className="p-4">
              <Spinner label="Loading notices…" showLabel />
            </div>
          )}
          {notices.data && notices.data.items.length === 0 && (
            <p className="p-4 text-sm text-muted">Nothing yet. Follow a tool to be told when its state changes.</p>
          )}
          {notices.data && notices.data.items.length > 0 && (
            <ul className="max-h-[60vh] divide-y divide-line overflow-y-auto">
              {notices.data.items.map((n) => (
                <li key={n.id} className={cx('flex gap-2 px-4 py-3', !n.readAt && 'bg-accent-tint')}>
                  <div className="min-w-0 flex-1">
                    <p className={cx('text-sm text-ink', !n.readAt && 'font-semibold')}>
                      {!n.readAt && <span className="sr-only">Unread: </span>}
                      {n.link ? (
                        <Link to={n.link} onClick={() => !n.readAt && markRead.mutate(n.id)} className="text-ink">
                          {n.title}
                        </Link>
                      ) : (
                        n.title
                      )}
                    </p>
                    {n.body && <p className="mt-0.5 line-clamp-2 text-xs text-muted">{n.body}</p>}
                    <p className="mt-0.5 text-xs text-muted">
                      <RelativeTime value={n.createdAt} />
                    </p>
                  </div>
                  {!n.readAt && (
                    <Button
                      variant="ghost"
                      className="shrink-0 text-xs"
                      onClick={() => markRead.mutate(n.id)}
                      aria-label={`Mark “${n.title}” read`}
                    >
                      Read
                    </Button>
                  )}
                </li>
              ))}
            </ul>
          )}
          {notices.data && notices.data.total > notices.data.items.length && limit < MAX && (
            <div className="border-t border-line px-4 py-2">
              <Button variant="secondary" busy={notices.isFetching} onClick={() => setLimit(Math.min(MAX, limit + PAGE))}>
                Show more
              </Button>
            </div>
          )}
        </div>
      )}
    </div>
  );
}
