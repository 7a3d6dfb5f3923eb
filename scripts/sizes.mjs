#!/usr/bin/env node
// Bundle sizes of a release build: raw and gzip -9 of the wasm, JS glue, CSS, whole dist/ and the
// single file. Prints a Markdown table; with --record, also writes it into docs/BUILD.md between
// the "sizes:begin" and "sizes:end" markers (scripts/build.sh --record does this).
import { readFileSync, readdirSync, statSync, writeFileSync, existsSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dist = join(root, 'dist');
const single = join(root, 'dist-single', 'bufferwright.html');
if (!existsSync(join(dist, 'index.html'))) {
  console.error('sizes: no dist/index.html; build first');
  process.exit(1);
}
const gz = (buf) => gzipSync(buf, { level: 9 }).length;
const kib = (n) => `${(n / 1024).toFixed(1)} KiB`;
const row = (label, files) => {
  const bufs = files.map((f) => readFileSync(f));
  const raw = bufs.reduce((a, b) => a + b.length, 0);
  const z = bufs.reduce((a, b) => a + gz(b), 0);
  return `| ${label} | ${raw} B (${kib(raw)}) | ${z} B (${kib(z)}) |`;
};
const top = readdirSync(dist).map((f) => join(dist, f));
const walk = (d) => readdirSync(d).flatMap((n) => (statSync(join(d, n)).isDirectory() ? walk(join(d, n)) : [join(d, n)]));
const pick = (re) => top.filter((f) => re.test(f));
const lines = [
  '| file | raw | gzip (node zlib, level 9) |',
  '| --- | --- | --- |',
  row('wasm (`app-*_bg.wasm`, wasm-opt -Oz)', pick(/_bg\.wasm$/)),
  row('JS glue (`app-*.js`)', pick(/app-[0-9a-f]+\.js$/)),
  row('CSS (`style-*.css` + `print.css`)', pick(/\.css$/)),
  row('all of `dist/` (incl. icons)', walk(dist)),
];
if (existsSync(single)) lines.push(row('`dist-single/bufferwright.html`', [single]));
const table = lines.join('\n');
console.log(table);

if (process.argv.includes('--record')) {
  const doc = join(root, 'docs', 'BUILD.md');
  const text = readFileSync(doc, 'utf8');
  const head = '<!-- sizes:begin -->';
  const tail = '<!-- sizes:end -->';
  const a = text.indexOf(head);
  const b = text.indexOf(tail);
  if (a < 0 || b < a) {
    console.error('sizes: markers not found in docs/BUILD.md');
    process.exit(1);
  }
  const when = new Date().toISOString().slice(0, 10);
  const block = `${head}\nRelease build of ${when} (trunk 0.21.14, wasm-bindgen 0.2.130, wasm-opt 132 \`-Oz\`):\n\n${table}\n${tail}`;
  writeFileSync(doc, text.slice(0, a) + block + text.slice(b + tail.length));
  console.log('sizes: recorded in docs/BUILD.md');
}
