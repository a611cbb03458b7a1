import { Link, useLocation } from 'react-router';
import { PageHeader } from '@/components/layout/page-header';

export function NotFoundPage() {
  const location = useLocation();
  return (
    <>
      <title>Page not found · Faultline</title>
      <PageHeader
        title="There is no page here"
        description="The link may be old, or the address mistyped. Nothing has been reported or changed."
      />
      <p className="mb-4 text-sm text-muted">
        Address: <code className="rounded bg-sunken px-1.5 py-0.5 font-mono text-ink">{location.pathname}</code>
      </p>
      <Link to="/" className="inline-flex min-h-11 items-center font-semibold">
        Back to the start page
      </Link>
    </>
  );
}
