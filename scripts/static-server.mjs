#!/usr/bin/env node
// Serve a built directory on loopback: node scripts/static-server.mjs [dir] [port]
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { startServer } from '../tests/e2e/server.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dir = process.argv[2] || join(root, 'dist');
const port = Number(process.argv[3] || process.env.PORT || 8080);
const host = process.env.HOST || '127.0.0.1';
const srv = await startServer({
  root: dir,
  host,
  port,
  aliases: { '/embed-example.html': join(root, 'docs', 'embed-example.html') },
  log: !!process.env.VERBOSE,
});
console.log(`Bufferwright is served at ${srv.url('/')}  (embed sample: ${srv.url('/embed-example.html')})`);
console.log('Press Ctrl+C to stop.');
const stop = () => srv.close().then(() => process.exit(0));
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
