import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { RelativeTime } from '@/components/ui/relative-time';
import { api } from '@/lib/api-client';
import type { LateMail, LateMailList } from '@shared/schemas/mail';

// Mail that has not gone out an hour after it was queued. Faultline keeps retrying it (with a
// back-off of at most ten minutes); this list lets an admin see it and try one again now.
// Page-local, like the caught-mail list: two calls used by this page only.

export const lateMailKeys = {
  all: ['late-mail'] as const,
};

export function lateMailQueryOptions() {
  return queryOptions({
    queryKey: lateMailKeys.all,
    queryFn: ({ signal }) => api.get<LateMailList>('/api/mail/late', { signal, params: { limit: 50 } }),
    refetchInterval: 60_000,
  });
}

function ResendButton({ mail }: { mail: LateMail }) {
  const queryClient = useQueryClient();
  const resend = useMutation({
    mutationFn: () => api.post<LateMail>(`/api/mail/${mail.id}/resend`),
    onSettled: () => queryClient.invalidateQueries({ queryKey: lateMailKeys.all }),
  });
  return (
    <Button
      variant="secondary"
      onClick={() => resend.mutate()}
      busy={resend.isPending}
      aria-label={`Send “${mail.subject}” to ${mail.to} again now`}
    >
      {resend.isSuccess ? 'Queued' : 'Send again now'}
    </Button>
  );
}

/** Shown on the admin mail page above the caught mail; nothing when all mail went out. */
export function LateMailSection() {
  const late = useQuery(lateMailQueryOptions());
  if (!late.data || late.data.total === 0) return null;
  const { items, total } = late.data;
  return (
    <section aria-labelledby="late-mail-title" className="mb-6 space-y-3">
      <Alert tone="warning" title={`${total} e-mail${total === 1 ? ' has' : 's have'} not been delivered for over an hour`}>
        Faultline keeps trying every few minutes. The last error usually says what is wrong with the mail server settings (SMTP_HOST,
        SMTP_PORT, SMTP_USER). Once it is fixed, send the mail again now instead of waiting.
      </Alert>
      <Card flush>
        <h2 id="late-mail-title" className="sr-only">
          Mail not delivered yet
        </h2>
        <ul className="divide-y divide-line">
          {items.map((mail) => (
            <li key={mail.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
              <div className="min-w-0 text-sm">
                <p className="font-semibold text-ink">{mail.subject}</p>
                <p className="break-all text-muted">to {mail.to}</p>
                <p className="text-xs text-muted">
                  Queued <RelativeTime value={mail.queuedAt} /> · {mail.attempts} attempts
                  {mail.lastError ? ` · last error: ${mail.lastError}` : ''}
                </p>
              </div>
              <ResendButton mail={mail} />
            </li>
          ))}
        </ul>
      </Card>
    </section>
  );
}
