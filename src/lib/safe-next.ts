/**
 * The `?next=` path after sign-in. Only a same-origin path is followed ("/sites/1"), never
 * "//evil.example" or "https://…", so the sign-in page cannot be used to send people elsewhere.
 */
export function safeNextPath(next: string | null | undefined, fallback = '/'): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return fallback;
  if (next.startsWith('/sign-in')) return fallback;
  return next;
}

export function signInPathFor(location: { pathname: string; search: string; hash?: string }): string {
  const here = `${location.pathname}${location.search}${location.hash ?? ''}`;
  return here === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(here)}`;
}
