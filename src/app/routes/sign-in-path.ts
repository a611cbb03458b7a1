// Where to send someone after sign-in. Only paths inside this app are accepted, so a crafted
// link cannot bounce a fresh session to another site ("//evil.example" is a URL, not a path).
export function safeNext(next: string | null | undefined): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
  if (next === '/sign-in' || next.startsWith('/sign-in?') || next.startsWith('/sign-in/')) return '/';
  return next;
}

/** The sign-in URL that brings the user back to `location` afterwards. */
export function signInPathFor(location: { pathname: string; search: string; hash?: string }): string {
  const back = location.pathname + location.search + (location.hash ?? '');
  return back === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(back)}`;
}
