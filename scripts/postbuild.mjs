#!/usr/bin/env node
// Trunk post_build hook (see Trunk.toml). Runs on the staging dir before trunk moves it to dist/.
//  1. Adds the sha256 of trunk's inline module loader to the CSP script-src in index.html.
//  2. Fills the service-worker template (public/sw.js, copied as sw.js) with the list of every
//     built file (hashed names included) and a cache version derived from their contents, so
//     each build that changes anything gets a new cache and old caches are dropped.
// Usage outside trunk: node scripts/postbuild.mjs <dir>
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync, readdirSync, statSync, existsSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { allowInlineScripts } from './lib/html.mjs';

const dir = process.env.TRUNK_STAGING_DIR || process.argv[2] || 'dist';
const fail = (msg) => {
  console.error(`postbuild: ${msg}`);
  process.exit(1);
};
if (!existsSync(dir)) fail(`directory ${dir} does not exist`);

// 1. CSP hash for inline scripts.
const indexPath = join(dir, 'index.html');
if (!existsSync(indexPath)) fail(`${indexPath} missing`);
const html = allowInlineScripts(readFileSync(indexPath, 'utf8'));
writeFileSync(indexPath, html);

// 2. Service worker precache list.
const swPath = join(dir, 'sw.js');
if (!existsSync(swPath)) fail(`${swPath} missing: is public/ copied (copy-dir) into the build?`);
const walk = (d) =>
  readdirSync(d).flatMap((name) => {
    const p = join(d, name);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
const files = walk(dir)
  .map((p) => relative(dir, p).split(sep).join('/'))
  .filter((f) => f !== 'sw.js')
  .sort();
const hash = createHash('sha256');
for (const f of files) hash.update(f).update('\0').update(readFileSync(join(dir, f)));
const version = hash.digest('hex').slice(0, 16);
const precache = ['./', ...files.map((f) => `./${f}`)];

let sw = readFileSync(swPath, 'utf8');
if (!sw.includes('__BUFFERWRIGHT_CACHE_VERSION__') || !sw.includes("['__BUFFERWRIGHT_PRECACHE__']")) {
  fail('sw.js has no placeholders (already processed, or template changed)');
}
sw = sw
  .replace('__BUFFERWRIGHT_CACHE_VERSION__', version)
  .replace("['__BUFFERWRIGHT_PRECACHE__']", JSON.stringify(precache, null, 2));
writeFileSync(swPath, sw);
console.log(`postbuild: CSP updated; sw.js cache bufferwright-${version}, ${precache.length} entries`);
