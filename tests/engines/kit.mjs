//! What every cross-engine journey shares: one test per engine (`journey`), a fresh loopback
//! server per journey (a new port is a new origin, so no storage or service worker carries over),
//! waiting for the app, finding fields by their labels and hooks by data-testid, pixel facts of
//! the plots, and the clean-page check (no errors, no request outside the page's origin).
import { test, after } from 'node:test';
import assert from 'node:assert/strict';
import { mkdirSync, writeFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { ENGINES, launchEngine } from './driver.mjs';
import { startServer } from '../e2e/server.mjs';
import { DIST, ROOT, ARTIFACTS } from '../e2e/harness.mjs';

export { ENGINES, ROOT, DIST };
export const tid = (id) => `[data-testid="${id}"]`;
const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

const running = new Map();
after(async () => {
  // An engine that failed to start has already failed its tests; close the others.
  for (const e of running.values()) await e.then((x) => x.close(), () => {});
});
/** The engine `name` (with `options`), started once per test file. */
function engine(name, options) {
  const key = `${name} ${JSON.stringify(options || {})}`;
  if (!running.has(key)) running.set(key, launchEngine(name, options));
  return running.get(key);
}

/**
 * Declare `title` once per engine. `fn({ engine, open, serve, t })`; `open(url, opts)` gives a
 * page in a fresh profile or context and closes it after the test. `only` limits the engines;
 * `options` go to launchEngine (Firefox preferences).
 */
export function journey(title, fn, { timeout = 240_000, only, options } = {}) {
  for (const name of ENGINES) {
    if (only && !only.includes(name)) continue;
    test(`${name}: ${title}`, { timeout }, async (t) => {
      const t0 = Date.now();
      const eng = await engine(name, options);
      const pages = [];
      const servers = [];
      const ctx = {
        engine: name,
        t,
        async serve() {
          const srv = await serveDist();
          servers.push(srv);
          return srv;
        },
        async open(url, opts = {}) {
          const origin = url.startsWith('file:') ? 'file://' : new URL(url).origin;
          const page = await eng.newPage({ ...opts, origin });
          pages.push(page);
          page.origin = origin;
          await page.goto(url);
          await waitForApp(page);
          return page;
        },
        async newPage(opts = {}) {
          const page = await eng.newPage(opts);
          pages.push(page);
          return page;
        },
      };
      try {
        await fn(ctx);
      } finally {
        for (const p of pages) await p.close();
        for (const s of servers) await s.close();
        t.diagnostic(`${name}: ${((Date.now() - t0) / 1000).toFixed(1)} s`);
      }
    });
  }
}

/** Serve dist/ on a free loopback port (close() also cuts kept-alive connections). */
export async function serveDist() {
  assert.ok(existsSync(join(DIST, 'index.html')), `${DIST}/index.html missing: run scripts/build.sh first`);
  return startServer({
    root: DIST,
    aliases: { '/embed-example.html': join(ROOT, 'docs', 'embed-example.html') },
  });
}

/** Poll `fn(...args)` in the page until it returns something truthy; returns that value. */
export async function waitFor(page, fn, args = [], { timeout = 60_000, what = fn.toString().slice(0, 120) } = {}) {
  const deadline = Date.now() + timeout;
  let last;
  for (;;) {
    try {
      last = await page.evaluate(fn, ...args);
      if (last) return last;
    } catch (e) {
      // A navigation in progress drops the evaluation; try again until the deadline.
      last = e.message;
    }
    if (Date.now() > deadline) throw new Error(`${page.engine}: timed out after ${timeout} ms waiting for ${what} (last: ${String(last).slice(0, 300)})`);
    await sleep(150);
  }
}

/**
 * Wait until the app has mounted (its root holds a data-testid hook and text), then install the
 * page-side error hook (console.error, uncaught errors and rejections), which is how errors are
 * seen in an engine whose driver reports no console messages.
 */
export async function waitForApp(page, { timeout = 90_000 } = {}) {
  await waitFor(
    page,
    () => {
      const root = document.querySelector('#app-root');
      return document.readyState === 'complete' && !!root && !!root.querySelector('[data-testid]') && root.innerText.trim().length > 0;
    },
    [],
    { timeout, what: 'the app to mount (#app-root with a data-testid hook)' },
  );
  await page.evaluate(() => {
    if (window.__bwSeen) return;
    window.__bwSeen = [];
    const orig = console.error.bind(console);
    console.error = (...a) => {
      window.__bwSeen.push(`console.error: ${a.map(String).join(' ')}`);
      orig(...a);
    };
    addEventListener('error', (e) => window.__bwSeen.push(`uncaught: ${e.message}`));
    addEventListener('unhandledrejection', (e) => window.__bwSeen.push(`unhandled rejection: ${e.reason}`));
  });
}

/**
 * Nothing bad seen: no console error or uncaught error (from the driver where it reports them,
 * and from the page's own hook in every engine), no failed request, and no request outside the
 * page's origin (from the driver where it sees requests, and from the page's resource timing,
 * which every engine keeps).
 */
export async function assertClean(page, label) {
  const where = `${page.engine}${label ? `, ${label}` : ''}`;
  const p = page.problems();
  const seen = await page.evaluate(() => window.__bwSeen || []);
  const resources = await page.evaluate(() =>
    [location.href, ...performance.getEntriesByType('resource').map((e) => e.name)],
  );
  const origin = page.origin;
  const foreignByTiming = resources.filter((u) => {
    if (u.startsWith('data:') || u.startsWith('blob:')) return false;
    if (origin === 'file://') return !u.startsWith('file://');
    try {
      return new URL(u).origin !== origin;
    } catch {
      return true;
    }
  });
  assert.deepEqual([...p.consoleErrors, ...seen], [], `console errors (${where})`);
  assert.deepEqual([...p.foreignRequests, ...foreignByTiming], [], `requests to other origins (${where})`);
  assert.deepEqual(p.failedRequests, [], `failed requests (${where})`);
}

/** The CSS selector of the input labelled `label` (a stable label of the page, exactly). */
export async function field(page, label) {
  const id = await waitFor(
    page,
    (l) => {
      const lab = [...document.querySelectorAll('label[for]')].find((e) => e.textContent.trim() === l);
      return lab && document.getElementById(lab.htmlFor) ? lab.htmlFor : null;
    },
    [label],
    { what: `a field labelled "${label}"` },
  );
  return `#${CSS_escape(id)}`;
}
const CSS_escape = (s) => s.replace(/[^A-Za-z0-9_-]/g, (c) => `\\${c}`);

/** Text of the first element matching `sel` (null if there is none). */
export const text = (page, sel) => page.evaluate((s) => document.querySelector(s)?.textContent ?? null, sel);
/** Value of the form control matching `sel`. */
export const value = (page, sel) => page.evaluate((s) => document.querySelector(s)?.value ?? null, sel);
/** Wait until `sel` exists; returns its text. */
export const textOf = (page, sel, opts = {}) =>
  waitFor(page, (s) => document.querySelector(s)?.textContent ?? null, [sel], { what: `${sel}`, ...opts });

/** Type into a field as a person does (select all, key by key), then optionally a key. */
export async function retype(page, sel, keys, then = null) {
  await page.type(sel, keys);
  if (then) await page.press(then);
}

/** Choose the option labelled `label` of a <select> (as picking it does: input, then change). */
export async function choose(page, sel, label) {
  const ok = await page.evaluate(
    (s, l) => {
      const el = document.querySelector(s);
      const i = el ? [...el.options].findIndex((o) => o.textContent.trim() === l) : -1;
      if (i < 0) return false;
      el.focus();
      el.selectedIndex = i;
      el.dispatchEvent(new Event('input', { bubbles: true }));
      el.dispatchEvent(new Event('change', { bubbles: true }));
      return true;
    },
    sel,
    label,
  );
  assert.ok(ok, `${page.engine}: option "${label}" in ${sel}`);
}

/** Pixel facts of every visible `canvas.plot`: CSS and backing sizes, DPR, colours seen. */
export function canvasFacts(page, selector = 'canvas.plot') {
  return page.evaluate((sel) => {
    return [...document.querySelectorAll(sel)]
      .filter((c) => c.getBoundingClientRect().width > 0)
      .map((c) => {
        const r = c.getBoundingClientRect();
        let colours = 0;
        let inked = 0;
        let error = null;
        try {
          const data = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
          const seen = new Set();
          const first = (data[0] << 24) | (data[1] << 16) | (data[2] << 8) | data[3];
          for (let i = 0; i < data.length; i += 4 * 5) {
            const px = (data[i] << 24) | (data[i + 1] << 16) | (data[i + 2] << 8) | data[i + 3];
            if (seen.size < 8) seen.add(px);
            if (px !== first) inked++;
          }
          colours = seen.size;
          inked /= data.length / 20;
        } catch (e) {
          error = String(e);
        }
        return {
          id: c.getAttribute('data-testid') || c.id || c.className,
          cssWidth: r.width,
          cssHeight: r.height,
          width: c.width,
          height: c.height,
          dpr: window.devicePixelRatio,
          colours,
          inked,
          error,
        };
      });
  }, selector);
}

/** Save a screenshot to tests/artifacts/engines/<engine>-<name>.png. */
export async function screenshot(page, name) {
  const dir = join(ARTIFACTS, 'engines');
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `${page.engine}-${name}.png`);
  writeFileSync(path, await page.screenshot());
  return path;
}
