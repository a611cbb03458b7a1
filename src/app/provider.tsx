import { Component, type ErrorInfo, type ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { configureApiClient } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { sessionKeys, sessionQueryOptions, type Session } from '@/features/auth/api/get-session';

// The API client reads the CSRF token from the session query and reports a lost session
// back to it. Wired here, once, so lib/ never imports a feature.
configureApiClient({
  async getCsrfToken() {
    const cached = queryClient.getQueryData<Session>(sessionKeys.current());
    const state = queryClient.getQueryState(sessionKeys.current());
    if (cached?.csrfToken && !state?.isInvalidated) return cached.csrfToken;
    return (await queryClient.fetchQuery({ ...sessionQueryOptions(), staleTime: 0 })).csrfToken;
  },
  async refreshCsrfToken() {
    return (await queryClient.fetchQuery({ ...sessionQueryOptions(), staleTime: 0 })).csrfToken;
  },
  onUnauthorized() {
    void queryClient.invalidateQueries({ queryKey: sessionKeys.all });
  },
});

interface BoundaryState {
  error: Error | null;
}

/**
 * Last line of defence for errors outside any route (the router shows its own error page
 * for errors inside routes). Plain markup only: the failure may be in our components.
 */
class AppErrorBoundary extends Component<{ children: ReactNode }, BoundaryState> {
  override state: BoundaryState = { error: null };

  static getDerivedStateFromError(error: Error): BoundaryState {
    return { error };
  }

  override componentDidCatch(error: Error, info: ErrorInfo) {
    console.error('Faultline stopped with an error', error, info.componentStack);
  }

  override render() {
    if (!this.state.error) return this.props.children;
    return (
      <div role="alert" style={{ maxWidth: '36rem', margin: '4rem auto', padding: '0 1rem', fontFamily: 'system-ui, sans-serif' }}>
        <h1 style={{ fontSize: '1.5rem', fontWeight: 700 }}>Faultline stopped with an error</h1>
        <p style={{ margin: '1rem 0' }}>
          Reload the page to start again. If it happens again, tell the facility staff what you were doing.
        </p>
        <button type="button" onClick={() => window.location.reload()} style={{ minHeight: 44, padding: '0 1rem', fontWeight: 600 }}>
          Reload the page
        </button>
      </div>
    );
  }
}

export function AppProvider({ children }: { children: ReactNode }) {
  return (
    <AppErrorBoundary>
      <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
    </AppErrorBoundary>
  );
}
