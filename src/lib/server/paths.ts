/**
 * A same-site path to go to after signing in; anything else (another site, a protocol-relative
 * address) becomes `/`.
 * @param value the `next` parameter.
 * @returns a safe path.
 */
export function safeNextPath(value: string | null | undefined): string {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return '/';
  return value;
}
