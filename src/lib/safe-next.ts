/** Only same-site paths are followed after sign-in (no open redirect to another host). */
export function safeNext(next: string | null | undefined, fallback = '/matters'): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\'))
    return fallback;
  if (next.startsWith('/sign-in')) return fallback;
  return next;
}
