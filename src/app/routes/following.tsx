import { Link } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';
import { Alert } from '@/components/ui/alert';
import { PageSpinner } from '@/components/ui/spinner';
import { RelativeTime } from '@/components/ui/relative-time';
import { StateBadge } from '@/components/ui/state-badge';
import { useFollowedTools } from '@/features/tools/api/get-followed-tools';

/** /following — the tools this person follows, with their state now. */
export function FollowingPage() {
  const list = useFollowedTools();
  return (
    <>
      <title>Tools I follow · Faultline</title>
      <PageHeader
        title="Tools I follow"
        description="You get an e-mail and a notice when one of these changes between Running, Limited, Down and the other states."
      />
      {list.isPending && <PageSpinner />}
      {list.isError && (
        <Alert tone="danger" title="The list could not be loaded">
          {list.error.message}
        </Alert>
      )}
      {list.data && list.data.items.length === 0 && (
        <Alert tone="info" title="You follow no tools yet">
          Open a tool from the <Link to="/board">status board</Link> and choose “Follow”.
        </Alert>
      )}
      {list.data && list.data.items.length > 0 && (
        <ul className="flex flex-col gap-3" data-testid="followed-tools">
          {list.data.items.map((t) => (
            <li key={t.id} className="flex flex-wrap items-center gap-3 rounded-xl border border-line bg-card p-4 amber:border-2">
              <div className="min-w-0 flex-1">
                <Link to={`/tools/${encodeURIComponent(t.code)}`} className="font-semibold">
                  {t.name}
                </Link>
                <p className="text-sm text-muted">
                  <span className="font-mono">{t.code}</span>
                  {t.note ? ` · ${t.note}` : ''}
                </p>
              </div>
              <div className="flex flex-col items-end gap-1">
                <StateBadge status={t.status} />
                <span className="text-xs text-muted">
                  since <RelativeTime value={t.since} />
                </span>
              </div>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

export { FollowingPage as Component };
