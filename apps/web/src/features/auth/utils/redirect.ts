/**
 * The `redirectTo` value if it is a path on this site, otherwise `null`. Guards against
 * open redirects such as `//evil.example` or `https://…`.
 */
export function safeRedirect(value: string | null | undefined): string | null {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) {
    return null;
  }
  if (value.startsWith('/sign-in')) return null;
  return value;
}
