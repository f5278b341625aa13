// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';
import { workerBuildIntegration } from './src/lib/workers/worker-build';
import { nodeAdapterHardening } from './src/lib/server/node-adapter-hardening';

// Host names the server answers to. Astro ignores the Host header of any other name (and then
// builds URLs for localhost, which breaks the sign-in origin check: see stack-notes.md).
// PUBLIC_URL's host and ALLOWED_HOSTS (comma-separated) are read at build time; scripts/start.mjs
// rebuilds when they change.
const allowedHosts = new Set(['127.0.0.1', 'localhost']);
if (process.env.PUBLIC_URL) {
  try {
    allowedHosts.add(new URL(process.env.PUBLIC_URL).hostname);
  } catch {
    // an invalid PUBLIC_URL is reported by the server's configuration check at start
  }
}
for (const host of (process.env.ALLOWED_HOSTS ?? '').split(',')) {
  if (host.trim()) allowedHosts.add(host.trim());
}

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  // The worker threads (audits, what-if, wave reader) are bundled on their own into dist/server/
  // (src/lib/workers/worker-build.ts; docs/decisions/004-audit-jobs.md, 018-workbook-worker.md).
  // React islands render in one go (renderToString), not through a stream read across turns of the
  // event loop: a page then finishes in the turn that started it (docs/decisions/025-reader-latency.md).
  integrations: [react({ experimentalDisableStreaming: true }), auth(), workerBuildIntegration()],
  server: { host: '127.0.0.1', port: 4321 },
  security: {
    // Cross-site requests are refused by our own origin check in src/middleware.ts (it exempts
    // bearer-token calls, which carry no ambient credentials); see docs/decisions/001-foundation.md.
    checkOrigin: false,
    allowedDomains: [...allowedHosts].map((hostname) => ({ hostname })),
  },
  experimental: {
    // Astro sends a Content-Security-Policy header with each page it renders: hashes of every
    // script and style it emits (no 'unsafe-inline'), plus the directives listed here.
    csp: {
      algorithm: 'SHA-256',
      directives: [
        "default-src 'self'",
        "img-src 'self' data:",
        "font-src 'self'",
        "connect-src 'self'",
        "object-src 'none'",
        "base-uri 'self'",
        "form-action 'self'",
        "frame-ancestors 'none'",
      ],
    },
  },
  vite: {
    // The socket's address for the sign-in limit, and 405 for TRACE (docs/decisions/014-hardening.md).
    plugins: [tailwindcss(), nodeAdapterHardening()],
    ssr: { external: ['better-sqlite3'] },
  },
});
