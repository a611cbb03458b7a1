import { useState } from 'react';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { useCreateFeed, useFeeds, useRevokeFeed } from '@/features/maintenance/api/calendar-feeds';
import type { FeedView } from '@/features/maintenance/api/types';

/** /calendar-feeds — my secret calendar links for booked maintenance windows. */
export function CalendarFeedsPage() {
  const feeds = useFeeds();
  const create = useCreateFeed();
  const revoke = useRevokeFeed();
  const [made, setMade] = useState<FeedView | null>(null);
  return (
    <>
      <title>Calendar feeds · Faultline</title>
      <PageHeader
        title="Calendar feeds"
        description="Booked maintenance windows in your calendar program. The link is a secret: anyone who has it can read the feed, so revoke it if it leaks."
      />
      <div className="flex flex-col gap-6">
        <Card as="section" title="Make a link for the whole facility">
          <div className="flex flex-col gap-3 px-5 pb-5">
            <div>
              <Button onClick={() => create.mutate({ scope: 'facility', scopeId: null }, { onSuccess: setMade })} busy={create.isPending}>
                Make a link
              </Button>
            </div>
            <p className="text-sm text-muted">
              For one tool or area, use the link on the tool page or ask for one via the API (scope “tool” or “area”).
            </p>
            {made?.url && (
              <Alert tone="success" live title="Copy this link now; it is shown only once">
                <code className="break-all" data-testid="feed-url">
                  {made.url}
                </code>
              </Alert>
            )}
          </div>
        </Card>
        <Card as="section" title="My links">
          <ul className="flex flex-col divide-y divide-line px-5 pb-5">
            {feeds.data?.items.length === 0 && <li className="py-2 text-sm text-muted">None.</li>}
            {feeds.data?.items.map((f) => (
              <li key={f.id} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
                <span>
                  {f.label} <span className="text-muted">· made {new Date(f.createdAt).toLocaleDateString()}</span>
                </span>
                <Button variant="danger" onClick={() => revoke.mutate(f.id)}>
                  Revoke
                </Button>
              </li>
            ))}
          </ul>
        </Card>
      </div>
    </>
  );
}

export const Component = CalendarFeedsPage;
