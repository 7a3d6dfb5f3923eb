#!/usr/bin/env node
// Turns the trunk release build (dist/) into one self-contained HTML file,
// dist-single/bufferwright.html, that works when opened from file://.
//  - stylesheets are inlined as <style>;
//  - the wasm-bindgen JS (--target web) is inlined as a module script with its exports removed;
//  - the wasm is inlined as base64 and handed to the init function as bytes;
//  - the SVG icon becomes a data: URL; links that make no sense offline from a file
//    (manifest, preloads, PNG icons) and the service-worker registration are dropped;
//  - the CSP meta is rewritten to allow exactly the inlined script by its sha256.
// Usage: node scripts/single-file.mjs [distDir] [outFile]
import { readFileSync, writeFileSync, mkdirSync, existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { cspHash, readCsp, writeCsp } from './lib/html.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dist = resolve(process.argv[2] || join(root, 'dist'));
const out = resolve(process.argv[3] || join(root, 'dist-single', 'bufferwright.html'));
const fail = (msg) => {
  console.error(`single-file: ${msg}`);
  process.exit(1);
};
if (!existsSync(join(dist, 'index.html'))) fail(`${dist}/index.html missing: run trunk build --release first`);

let html = readFileSync(join(dist, 'index.html'), 'utf8');
const attr = (tag, name) => {
  const m = tag.match(new RegExp(`\\b${name}\\s*=\\s*"([^"]*)"`, 'i'));
  return m ? m[1] : null;
};
const local = (href) => join(dist, href.replace(/^\.?\//, '').split(/[?#]/)[0]);

// Trunk's inline loader tells us which JS and wasm files belong to the app.
const loader = [...html.matchAll(/<script type="module"[^>]*>([\s\S]*?)<\/script>/gi)].find((m) =>
  /import init/.test(m[1]),
);
if (!loader) fail('trunk loader script (import init ...) not found in index.html');
const jsHref = loader[1].match(/from\s+'([^']+\.js)'/)?.[1];
const wasmHref = loader[1].match(/'([^']+_bg\.wasm)'/)?.[1];
if (!jsHref || !wasmHref) fail('could not read JS/wasm file names from the trunk loader');

// wasm-bindgen glue as a classic-free module body: drop the export statements.
let js = readFileSync(local(jsHref), 'utf8');
if (/^\s*import\s/m.test(js)) fail(`${jsHref} imports other modules (snippets); inlining them is not supported`);
// Remember every exported name so the page gets the same window.wasmBindings as trunk's loader.
const exported = [];
js = js
  .replace(/^export\s+default\s+([\w$]+)\s*;?\s*$/m, 'const __bw_default_init = $1;')
  .replace(/^export\s*\{([^}]*)\}\s*;?\s*$/gm, (_, names) => {
    let out = '';
    for (const item of names.split(',').map((x) => x.trim()).filter(Boolean)) {
      const [local, as] = item.split(/\s+as\s+/);
      if (as === 'default') out += `const __bw_default_init = ${local};\n`;
      else exported.push(as && as !== local ? `${as}: ${local}` : local);
    }
    return out;
  })
  .replace(/^export\s+((?:async\s+)?function\*?|class|const|let|var)\s+([\w$]+)/gm, (_, kw, name) => {
    exported.push(name);
    return `${kw} ${name}`;
  });
if (/^export\b/m.test(js)) fail('unexpected export form left in the wasm-bindgen JS');
if (!js.includes('__bw_default_init')) fail('default export (init function) not found in the wasm-bindgen JS');

const wasmB64 = readFileSync(local(wasmHref)).toString('base64');
const boot = `${js}
const __bw_bytes = Uint8Array.from(atob(${JSON.stringify(wasmB64)}), (c) => c.charCodeAt(0));
const __bw_wasm = await __bw_default_init({ module_or_path: __bw_bytes });
window.wasmBindings = { ${exported.join(', ')} };
dispatchEvent(new CustomEvent("TrunkApplicationStarted", {detail: {wasm: __bw_wasm}}));
`;
// Escape a literal "</script" that could end the element early.
const bootSafe = boot.replace(/<\/script/gi, '<\\/script');
html = html.replace(loader[0], () => `<script type="module">${bootSafe}</script>`);

// Links: inline stylesheets, inline the SVG icon, drop the rest.
html = html.replace(/<link\b[^>]*>/gi, (tag) => {
  const rel = (attr(tag, 'rel') || '').toLowerCase();
  const href = attr(tag, 'href');
  if (rel === 'stylesheet' && href) {
    const media = attr(tag, 'media');
    const css = readFileSync(local(href), 'utf8');
    if (/url\(\s*['"]?(?!data:)/i.test(css)) console.warn(`single-file: ${href} references url(...) files, which are not inlined`);
    return `<style${media ? ` media="${media}"` : ''}>${css}</style>`;
  }
  if (rel === 'icon' && href && href.endsWith('.svg')) {
    const svg = readFileSync(local(href)).toString('base64');
    return `<link rel="icon" type="image/svg+xml" href="data:image/svg+xml;base64,${svg}">`;
  }
  return '';
});
// External classic scripts (service-worker registration) do not apply to file://.
html = html.replace(/<script\b[^>]*\bsrc\s*=\s*"[^"]*"[^>]*>\s*<\/script>/gi, '');

const csp = readCsp(html);
csp.set('script-src', [cspHash(bootSafe), "'wasm-unsafe-eval'"]);
csp.set('style-src', ["'unsafe-inline'"]);
csp.set('img-src', ['data:', 'blob:']);
csp.set('default-src', ["'none'"]);
for (const k of ['connect-src', 'worker-src', 'manifest-src', 'font-src']) csp.delete(k);
csp.set('form-action', ["'none'"]);
html = writeCsp(html, csp);

mkdirSync(dirname(out), { recursive: true });
writeFileSync(out, html);
console.log(`single-file: wrote ${out} (${(Buffer.byteLength(html) / 1024).toFixed(1)} KiB)`);
