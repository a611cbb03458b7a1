import { Fragment, useState } from 'react';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { PageSpinner } from '@/components/ui/spinner';
import { api, isApiError } from '@/lib/api-client';
import { cx } from '@/lib/cx';

// The caught-mail list is a demo aid with one read-only call, so its query lives with its
// page rather than in a feature folder of its own.

export interface CaughtMail {
  id: string | number;
  to: string | string[];
  subject: string;
  text: string;
  receivedAt: string;
}

export interface CaughtMailList {
  items: CaughtMail[];
  total: number;
}

export const caughtMailKeys = {
  all: ['caught-mail'] as const,
  list: (limit: number) => [...caughtMailKeys.all, 'list', { limit }] as const,
};

// The API pages by limit and offset (at most 200 at a time); a demo rarely needs more.
const PAGE = 50;
const MAX_LIMIT = 200;

export function caughtMailQueryOptions(limit = PAGE) {
  return queryOptions({
    queryKey: caughtMailKeys.list(limit),
    queryFn: ({ signal }) => api.get<CaughtMailList>('/api/mail', { signal, params: { limit } }),
    // Mail arrives without a socket event; a short poll keeps the list current during a demo.
    refetchInterval: 15_000,
    placeholderData: keepPreviousData,
  });
}

function recipients(to: CaughtMail['to']): string {
  return Array.isArray(to) ? to.join(', ') : to;
}

export function CaughtMailPage() {
  const [limit, setLimit] = useState(PAGE);
  const mail = useQuery(caughtMailQueryOptions(limit));
  const [openId, setOpenId] = useState<CaughtMail['id'] | null>(null);

  const catcherOff = isApiError(mail.error) && mail.error.code === 'mail_catcher_off';
  // After a failed refresh the last list stays in view, except when the catcher has stopped.
  const list = catcherOff ? undefined : mail.data;

  return (
    <>
      <title>Caught mail · Faultline</title>
      <PageHeader
        title="Caught mail"
        description="Every e-mail Faultline sent while the demo’s local mail catcher runs. Nothing here left the machine."
        actions={
          <Button variant="secondary" onClick={() => void mail.refetch()} busy={mail.isFetching && !mail.isPending}>
            Refresh
          </Button>
        }
      />

      {mail.isPending && <PageSpinner label="Loading caught mail…" />}

      {catcherOff && (
        <Alert tone="info" title="The mail catcher is not running">
          Caught mail is kept only while the local mail catcher runs, as it does in the demo. With a real mail server configured, messages
          go out to their recipients instead and are not shown here.
        </Alert>
      )}

      {mail.isError && !catcherOff && (
        <Alert
          tone="danger"
          live
          title="The caught mail could not be loaded"
          actions={
            <Button variant="secondary" onClick={() => void mail.refetch()}>
              Try again
            </Button>
          }
        >
          {mail.error.message}
        </Alert>
      )}

      {list && list.items.length === 0 && (
        <Alert tone="info" title="No mail caught yet">
          Messages appear here as Faultline sends them: invitations, password resets and notices about tools and reports.
        </Alert>
      )}

      {list && list.items.length > 0 && (
        <Card flush>
          <table className="w-full border-collapse text-left text-sm">
            <caption className="sr-only">Caught e-mail, newest first. Choose a subject to read the message.</caption>
            <thead className="border-b border-line text-xs font-semibold tracking-wide text-muted uppercase">
              <tr>
                <th scope="col" className="px-4 py-3">
                  Subject
                </th>
                <th scope="col" className="hidden px-4 py-3 md:table-cell">
                  To
                </th>
                <th scope="col" className="px-4 py-3 text-right">
                  Received
                </th>
              </tr>
            </thead>
            <tbody>
              {list.items.map((item) => {
                const open = openId === item.id;
                const panelId = `mail-${item.id}`;
                return (
                  <Fragment key={item.id}>
                    <tr className={cx('border-b border-line align-top', open && 'bg-sunken')}>
                      <td className="px-2 py-1">
                        <button
                          type="button"
                          aria-expanded={open}
                          aria-controls={open ? panelId : undefined}
                          onClick={() => setOpenId(open ? null : item.id)}
                          className="flex min-h-11 w-full flex-col items-start justify-center rounded-md px-2 py-1.5 text-left hover:bg-sunken"
                        >
                          <span className="font-semibold text-ink">{item.subject || '(no subject)'}</span>
                          <span className="text-xs text-muted md:hidden">to {recipients(item.to)}</span>
                        </button>
                      </td>
                      <td className="hidden px-4 py-3 break-all text-muted md:table-cell">{recipients(item.to)}</td>
                      <td className="px-4 py-3 text-right whitespace-nowrap text-muted">
                        <RelativeTime value={item.receivedAt} />
                      </td>
                    </tr>
                    {open && (
                      <tr id={panelId} className="border-b border-line bg-sunken">
                        <td colSpan={3} className="px-4 pb-4">
                          <pre className="max-h-[60vh] overflow-auto rounded-lg border border-line bg-card p-4 font-mono text-xs leading-relaxed break-words whitespace-pre-wrap text-ink">
                            {item.text}
                          </pre>
                        </td>
                      </tr>
                    )}
                  </Fragment>
                );
              })}
            </tbody>
          </table>
          <div className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
            <p className="text-xs text-muted">
              Showing {list.items.length} of {list.total} messages.
            </p>
            {list.total > list.items.length && limit < MAX_LIMIT && (
              <Button
                variant="secondary"
                onClick={() => setLimit((current) => Math.min(current + PAGE, MAX_LIMIT))}
                busy={mail.isPlaceholderData}
              >
                Show older messages
              </Button>
            )}
          </div>
        </Card>
      )}
    </>
  );
}

export { CaughtMailPage as Component };
