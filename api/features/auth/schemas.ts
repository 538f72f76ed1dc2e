/**
 * Only a path on this site may be returned to after sign-in (no open redirects): it starts with one "/",
 * has no backslash (browsers read "/\\evil.example" as another host) and no control characters.
 * Shared by the server and the web app so both apply the same rule. No server imports here.
 */
export function safeReturnTo(value: unknown): string | undefined {
  if (typeof value !== 'string' || !value.startsWith('/') || value.startsWith('//') || value.includes('\\')) return undefined;
  if (/[\u0000-\u001f\u007f]/.test(value)) return undefined;
  return value.slice(0, 500);
}
