/**
 * Response headers that hold for every answer. Pages rendered by Astro carry its
 * Content-Security-Policy header (hashes of every script and style it emits plus the directives
 * in astro.config.mjs); it is kept, with frame-ancestors added if missing. Any other answer (JSON,
 * redirects, plain pages) gets a policy that allows nothing. When the site is served over https
 * (PUBLIC_URL), every answer also carries Strict-Transport-Security.
 */

/** One year, without includeSubDomains or preload: the server does not know what else runs on its domain (common practice). */
export const strictTransportSecurity = 'max-age=31536000';

const common: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'same-origin',
  'X-Frame-Options': 'DENY',
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), payment=()',
};

const nothingAllowed = "default-src 'none'; frame-ancestors 'none'";

/**
 * Adds the security headers to a response (in place when its headers are mutable).
 * @param response the response.
 * @param isAsset whether it is a built, fingerprinted asset (cached, no policy needed beyond nosniff).
 * @param https whether the site is served over https (PUBLIC_URL): adds Strict-Transport-Security.
 * @returns a response with the headers.
 */
export function withSecurityHeaders(response: Response, isAsset: boolean, https = false): Response {
  let target = response;
  try {
    target.headers.set('X-Content-Type-Options', 'nosniff');
  } catch {
    target = new Response(response.body, response);
  }
  for (const [name, value] of Object.entries(common)) target.headers.set(name, value);
  if (https) target.headers.set('Strict-Transport-Security', strictTransportSecurity);
  if (isAsset) return target;
  const astroPolicy = target.headers.get('Content-Security-Policy');
  if (!astroPolicy) target.headers.set('Content-Security-Policy', nothingAllowed);
  else if (!astroPolicy.includes('frame-ancestors')) target.headers.set('Content-Security-Policy', `${astroPolicy.replace(/;?\s*$/, ';')} frame-ancestors 'none'`);
  if (!target.headers.has('Cache-Control')) target.headers.set('Cache-Control', 'no-store');
  return target;
}
