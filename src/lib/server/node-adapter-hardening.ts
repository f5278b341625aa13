/**
 * Fixes to the Node adapter's request handling and Astro's page rendering, applied to their code
 * while Vite bundles it into dist/server (the files in node_modules are never changed):
 *
 * 1. The client address. Astro's NodeApp takes the first `X-Forwarded-For` value as the client
 *    address whatever the configuration, so anyone could pick the address the sign-in limit
 *    counts against. The socket's own address is kept on the request under
 *    {@link socketAddressSymbol}; the middleware uses forwarded headers only with TRUST_PROXY=1.
 * 2. Methods the Fetch API refuses (TRACE, TRACK, CONNECT): `new Request()` throws for them and
 *    the adapter answered 500. They get 405 with the security headers.
 * 3. The static-file check. The adapter looked for a file in dist/client before every page
 *    (a synchronous `lstat`, then `send`'s asynchronous `stat` and its not-found error): every
 *    file there has an extension (`/_astro/…`, `/favicon.svg`, `/robots.txt`) and no page path
 *    does, so only paths with an extension are looked up (docs/decisions/025-reader-latency.md).
 * 4. The content-security-policy hashes of the page head's inline script and style. Astro hashed
 *    the same few build-time texts with WebCrypto on every page (a thread-pool job each); the
 *    hash of a text is kept by the text (docs/decisions/025-reader-latency.md).
 * 5. A malformed percent-encoding in the address (`/api/x%ZZ`): the standalone handler answered a
 *    plain-text "Bad request."; it gets the API's JSON error shape and headers (400).
 * 6. Requests Node's HTTP parser cannot read (an unknown method token such as `FOO` or `TRACK`,
 *    a malformed request line or header, headers too large): Node answered them itself with a
 *    bare status and no body, before any of our code. They get the API's JSON error shape and
 *    headers: 501 for a method the server does not know (RFC 9110 §9.1), 431 for headers too
 *    large, 408 for a request that took too long, 400 for the rest.
 * 7. React islands rendered in one go (`experimentalDisableStreaming` in astro.config.mjs) keep
 *    the island's id prefix, as the streaming renderer did and as the browser hydrates with
 *    (`useId` answers the same on both sides).
 *
 * Each edit must find the text it replaces: an upgrade of astro or @astrojs/node that changes
 * it fails the build here, so the fix is never silently lost (docs/decisions/014-hardening.md).
 */
import type { Plugin } from 'vite';

/** Where the socket's remote address is kept on each Request. */
export const socketAddressSymbol = Symbol.for('paredown.socketAddress');

interface Edit {
  /** The end of the module id (a path inside node_modules). */
  file: string;
  find: string;
  replace: string;
}

/** The API's security headers and JSON content type, which the adapter's own answers lack. */
const apiErrorHeaders: readonly (readonly [string, string])[] = [
  ['Content-Type', 'application/json; charset=utf-8'],
  ['Cache-Control', 'no-store'],
  ['X-Content-Type-Options', 'nosniff'],
  ['X-Frame-Options', 'DENY'],
  ['Referrer-Policy', 'same-origin'],
  ['Content-Security-Policy', "default-src 'none'; frame-ancestors 'none'"],
];

/** {@link apiErrorHeaders} set on a raw Node response (code inserted into the adapter). */
const jsonErrorHeaders = apiErrorHeaders.map(([name, value]) => `\n      res.setHeader(${JSON.stringify(name)}, ${JSON.stringify(value)});`).join('');

/** {@link apiErrorHeaders} as the header lines (each ending in CR LF) of a response written straight to a socket. */
const rawErrorHeaderLines = apiErrorHeaders.map(([name, value]) => `${name}: ${value}\r\n`).join('');

const refusedMethodAnswer = `
      const refusedMethod = /^(TRACE|TRACK|CONNECT)$/i.test(String(req.method ?? ""));
      res.statusCode = refusedMethod ? 405 : 400;
      if (refusedMethod) res.setHeader("Allow", "GET, HEAD, POST, PUT, PATCH, DELETE");${jsonErrorHeaders}
      res.end(JSON.stringify({ error: refusedMethod
        ? { code: "method-not-allowed", message: "This server does not answer " + String(req.method) + " requests." }
        : { code: "bad-request", message: "The request could not be read." } }));`;

const malformedAddressAnswer = `
      res.statusCode = 400;${jsonErrorHeaders}
      res.end(JSON.stringify({ error: { code: "malformed-address", message: "The address could not be read: a % in it is not followed by two hexadecimal digits of a valid UTF-8 sequence. Write a literal % as %25." } }));`;

/**
 * The answer to a request the HTTP parser refused (the server's 'clientError' event), written to
 * the socket since no response object exists yet. The status follows Node's own choice (431 for
 * headers too large, 408 for a timeout, 400 otherwise) except for an unknown method, 501.
 */
const unreadableRequestAnswer = `
  httpServer.on("clientError", (error, socket) => {
    // As Node's own handler: no answer on a reset or closed socket, or once a response on this
    // connection has begun (an answer then would corrupt it).
    if (error.code === "ECONNRESET" || !socket.writable || socket._httpMessage?._headerSent) {
      socket.destroy();
      return;
    }
    const code = String(error.code ?? "");
    const method = /^([!#$%&'*+.^_\`|~0-9A-Za-z-]{1,24}) /.exec(Buffer.isBuffer(error.rawPacket) ? error.rawPacket.toString("latin1", 0, 32) : "")?.[1];
    const [status, reason, body] =
      code === "HPE_INVALID_METHOD"
        ? [501, "Not Implemented", { code: "unknown-method", message: (method ? "This server does not know the method " + method : "This server does not know the request's method") + "; it answers GET, HEAD, POST, PUT, PATCH and DELETE." }]
        : code === "HPE_HEADER_OVERFLOW"
          ? [431, "Request Header Fields Too Large", { code: "headers-too-large", message: "The request's headers are too large; send fewer or shorter cookies and headers." }]
          : code === "ERR_HTTP_REQUEST_TIMEOUT"
            ? [408, "Request Timeout", { code: "request-timeout", message: "The request took too long to arrive; send it again." }]
            : [400, "Bad Request", { code: "bad-request", message: "The request could not be read as HTTP/1.1: its request line or a header is malformed." }];
    const text = JSON.stringify({ error: body });
    socket.end(
      "HTTP/1.1 " + status + " " + reason + "\\r\\n" +
        ${JSON.stringify(rawErrorHeaderLines)} +
        "Content-Length: " + Buffer.byteLength(text) + "\\r\\nConnection: close\\r\\n\\r\\n" + text,
    );
  });`;

export const nodeAdapterEdits: readonly Edit[] = [
  {
    file: '/astro/dist/core/app/node.js',
    find: 'const clientIp = forwardedClientIp || req.socket?.remoteAddress;',
    replace: `Reflect.set(request, Symbol.for("paredown.socketAddress"), req.socket?.remoteAddress ?? "");
    const clientIp = forwardedClientIp || req.socket?.remoteAddress;`,
  },
  {
    file: '/@astrojs/node/dist/serve-app.js',
    find: `      logger.error(\`Could not render \${req.url}\`);
      console.error(err);
      res.statusCode = 500;
      res.end("Internal Server Error");`,
    replace: refusedMethodAnswer,
  },
  {
    file: '/@astrojs/node/dist/standalone.js',
    find: `      res.writeHead(400);
      res.end("Bad request.");`,
    replace: malformedAddressAnswer,
  },
  {
    file: '/@astrojs/node/dist/standalone.js',
    find: `  enableDestroy(httpServer);`,
    replace: `  enableDestroy(httpServer);${unreadableRequestAnswer}`,
  },
  {
    file: '/@astrojs/react/dist/server.js',
    find: 'html = ReactDOM.renderToString(vnode);',
    replace: 'html = ReactDOM.renderToString(vnode, { identifierPrefix: prefix });',
  },
  {
    file: '/@astrojs/node/dist/serve-static.js',
    find: `  return (req, res, ssr) => {
    if (req.url) {`,
    replace: `  return (req, res, ssr) => {
    if (req.url && hasFileExtension(req.url.split("#")[0].split("?")[0])) {`,
  },
  {
    file: '/astro/dist/core/render-context.js',
    find: 'import { generateCspDigest } from "./encryption.js";',
    replace: `import { generateCspDigest as hashForCsp } from "./encryption.js";
const keptCspDigests = new Map();
function generateCspDigest(data, algorithm) {
  const key = algorithm + "\u0000" + data;
  let digest = keptCspDigests.get(key);
  if (digest === undefined) {
    digest = hashForCsp(data, algorithm);
    if (keptCspDigests.size < 256) {
      keptCspDigests.set(key, digest);
      digest.catch(() => keptCspDigests.delete(key));
    }
  }
  return digest;
}`,
  },
];

/**
 * The Vite plugin that applies {@link nodeAdapterEdits}.
 * @throws Error (failing the build) when a file's text to replace is not found.
 * @returns the plugin.
 */
export function nodeAdapterHardening(): Plugin {
  const seen = new Set<string>();
  return {
    name: 'paredown-node-adapter-hardening',
    enforce: 'pre',
    transform(code, id) {
      const path = id.split('?')[0].replaceAll('\\', '/');
      let changed = code;
      for (const edit of nodeAdapterEdits) {
        if (!path.endsWith(edit.file)) continue;
        if (!changed.includes(edit.find)) {
          throw new Error(`paredown-node-adapter-hardening: ${edit.file} no longer holds the text this fix replaces; see docs/decisions/014-hardening.md`);
        }
        changed = changed.replace(edit.find, edit.replace);
        seen.add(edit.file);
      }
      return changed === code ? null : { code: changed, map: null };
    },
    buildEnd(error) {
      if (error) return;
      const missing = nodeAdapterEdits.filter((edit) => !seen.has(edit.file));
      if (missing.length > 0 && seen.size > 0) {
        throw new Error(`paredown-node-adapter-hardening: not applied to ${missing.map((edit) => edit.file).join(', ')}`);
      }
    },
  };
}
