/**
 * Where to go after signing in: only a path on this site. Pure, shared by the sign-in page (on the
 * server), the sign-in form (in the browser) and Auth.js's redirect callback, so all three agree.
 */

// Control characters (C0, DEL, C1), the line and paragraph separators, and the backslash, which
// browsers strip or read as `/` and so can turn `/\t/evil.test` or `/\evil.test` into `//evil.test`.
// eslint-disable-next-line no-control-regex
const unsafeCharacters = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\\]/;

const probeOrigin = 'http://paredown.invalid';

/**
 * A same-site path to go to after signing in; anything else (another site, a protocol-relative
 * address, control characters or backslashes, raw or percent-encoded) becomes `/`.
 * @param value the `next` parameter (decoded once, as URLSearchParams gives it), or anything else.
 * @returns a path that starts with exactly one `/`.
 */
export function safeNextPath(value: unknown): string {
  if (typeof value !== 'string' || value === '' || value.length > 2000) return '/';
  if (!value.startsWith('/') || value.startsWith('//') || unsafeCharacters.test(value)) return '/';
  let decoded: string;
  try {
    decoded = decodeURIComponent(value);
  } catch {
    return '/';
  }
  if (decoded.startsWith('//') || unsafeCharacters.test(decoded)) return '/';
  let url: URL;
  try {
    url = new URL(value, probeOrigin);
  } catch {
    return '/';
  }
  if (url.origin !== probeOrigin) return '/';
  const path = `${url.pathname}${url.search}${url.hash}`;
  if (!path.startsWith('/') || path.startsWith('//') || path.startsWith('/\\')) return '/';
  return path;
}

/**
 * Auth.js's redirect: a same-origin address, made from the path of what was asked.
 * @param url what Auth.js was asked to go to (absolute or a path).
 * @param baseUrl the site's own origin, as Auth.js gives it.
 * @returns an absolute address on baseUrl's origin.
 */
export function safeRedirectUrl(url: unknown, baseUrl: string): string {
  const origin = new URL(baseUrl).origin;
  if (typeof url !== 'string' || unsafeCharacters.test(url)) return `${origin}/`;
  if (url.startsWith('/')) return `${origin}${safeNextPath(url)}`;
  try {
    const target = new URL(url);
    if (target.origin !== origin) return `${origin}/`;
    return `${origin}${safeNextPath(`${target.pathname}${target.search}${target.hash}`)}`;
  } catch {
    return `${origin}/`;
  }
}
