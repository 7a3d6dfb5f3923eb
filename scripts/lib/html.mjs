// Small helpers shared by scripts/postbuild.mjs and scripts/single-file.mjs.
// The HTML they read is trunk's own output, so plain regular expressions suffice.
import { createHash } from 'node:crypto';

/** sha256 CSP source expression ('sha256-…') for an inline script or style body. */
export function cspHash(text) {
  return `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
}

/** Bodies of all inline <script> elements (those without a src attribute). */
export function inlineScripts(html) {
  const out = [];
  for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
    if (!/\bsrc\s*=/.test(m[1])) out.push(m[2]);
  }
  return out;
}

const CSP_META = /(<meta\s+http-equiv="Content-Security-Policy"\s+content=")([^"]*)(")/i;

/** Read the policy from the CSP meta element, as a Map of directive -> source list. */
export function readCsp(html) {
  const m = html.match(CSP_META);
  if (!m) throw new Error('no <meta http-equiv="Content-Security-Policy"> found in the HTML');
  const map = new Map();
  for (const part of m[2].split(';')) {
    const words = part.trim().split(/\s+/).filter(Boolean);
    if (words.length) map.set(words[0], words.slice(1));
  }
  return map;
}

/** Replace the CSP meta content with the given Map. */
export function writeCsp(html, map) {
  const text = [...map].map(([k, v]) => [k, ...v].join(' ')).join('; ');
  return html.replace(CSP_META, (_, a, _old, c) => `${a}${text}${c}`);
}

/** Add the hash of every inline script to script-src (idempotent). */
export function allowInlineScripts(html) {
  const csp = readCsp(html);
  const src = (csp.get('script-src') || ["'self'"]).filter((s) => !s.startsWith("'sha256-"));
  for (const body of inlineScripts(html)) {
    const h = cspHash(body);
    if (!src.includes(h)) src.push(h);
  }
  csp.set('script-src', src);
  return writeCsp(html, csp);
}
