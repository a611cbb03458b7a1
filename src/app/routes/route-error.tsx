import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import { Button } from '@/components/ui/button';
import { Alert } from '@/components/ui/alert';
import { isApiError } from '@/lib/api-client';

interface Explained {
  title: string;
  text: string;
}

// After a new release the old page may ask for a code file that is gone: a reload fixes it.
function isStaleChunk(error: unknown): boolean {
  return (
    error instanceof Error && /dynamically imported module|Importing a module script failed|error loading dynamically/i.test(error.message)
  );
}

function explain(error: unknown): Explained {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) return { title: 'There is no page here', text: 'The link may be old, or the address mistyped.' };
    return { title: 'This page could not be shown', text: `The server answered ${error.status} ${error.statusText}.` };
  }
  if (isApiError(error)) {
    if (error.isNetworkError) return { title: 'Faultline cannot be reached', text: 'Check the network connection, then try again.' };
    if (error.status === 403) return { title: 'Not allowed', text: error.message };
    if (error.status === 404) return { title: 'Not found', text: error.message };
    return { title: 'Something went wrong on the server', text: error.message };
  }
  if (isStaleChunk(error)) return { title: 'Faultline was updated', text: 'Reload the page to get the new version.' };
  return { title: 'Something went wrong', text: 'This page ran into a problem it did not expect. Reloading usually helps.' };
}

/** Shown in place of a route whose loader or page failed. */
export function RouteErrorPage() {
  const error = useRouteError();
  const { title, text } = explain(error);
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4 px-4 py-12">
      <title>{`${title} · Faultline`}</title>
      <h1 className="text-2xl font-bold text-ink">{title}</h1>
      <Alert tone="danger">{text}</Alert>
      <p className="text-sm text-muted">If it keeps happening, tell the facility staff what you were doing when it appeared.</p>
      <div className="flex flex-wrap gap-3">
        <Button onClick={() => window.location.reload()}>Reload the page</Button>
        <Link to="/" className="inline-flex min-h-11 items-center px-2 font-semibold" reloadDocument>
          Go to the start page
        </Link>
      </div>
    </div>
  );
}
