// Tiny static file server for dist/ (and docs/embed-example.html at /embed-example.html).
// Used by the e2e harness and by scripts/serve.sh. Loopback only.
import { createServer } from 'node:http';
import { createReadStream, statSync } from 'node:fs';
import { extname, join, normalize, resolve, sep } from 'node:path';

export const MIME = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.wasm': 'application/wasm',
  '.webmanifest': 'application/manifest+json',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.txt': 'text/plain; charset=utf-8',
};

/**
 * Start serving `root`. `aliases` maps URL paths to files outside root.
 * Resolves to { server, port, origin, url(path), close() }.
 */
export function startServer({ root, host = '127.0.0.1', port = 0, aliases = {}, log = false } = {}) {
  const base = resolve(root);
  const server = createServer((req, res) => {
    const url = new URL(req.url, 'http://x');
    let path = decodeURIComponent(url.pathname);
    let file = aliases[path];
    if (!file) {
      if (path.endsWith('/')) path += 'index.html';
      file = normalize(join(base, path));
      if (file !== base && !file.startsWith(base + sep)) {
        res.writeHead(403).end('forbidden');
        return;
      }
    }
    let st;
    try {
      st = statSync(file);
    } catch {
      st = null;
    }
    if (!st || !st.isFile()) {
      if (log) console.log(`404 ${req.method} ${req.url}`);
      res.writeHead(404, { 'content-type': 'text/plain' }).end('not found');
      return;
    }
    const headers = {
      'content-type': MIME[extname(file).toLowerCase()] || 'application/octet-stream',
      'content-length': st.size,
      'cache-control': 'no-cache',
    };
    if (log) console.log(`200 ${req.method} ${req.url}`);
    res.writeHead(200, headers);
    if (req.method === 'HEAD') res.end();
    else createReadStream(file).pipe(res);
  });
  return new Promise((ok, fail) => {
    server.once('error', fail);
    server.listen(port, host, () => {
      const actual = server.address().port;
      const origin = `http://${host}:${actual}`;
      ok({
        server,
        port: actual,
        origin,
        url: (p = '/') => origin + p,
        // Also cuts kept-alive and in-flight connections: a browser (or its service worker)
        // holding one open must never keep close() - and so a test file - waiting forever.
        close: () => {
          if (!server.listening) return Promise.resolve();
          const done = new Promise((ok) => server.close(() => ok()));
          server.closeAllConnections();
          return done;
        },
      });
    });
  });
}
