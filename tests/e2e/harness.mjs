// End-to-end harness for Bufferwright: a loopback static server over dist/, Debian Chromium via
// playwright-core, and watchers that make a test fail on console errors or on any request that
// leaves the server's origin. Used by the *.test.mjs files in this folder (node --test tests/e2e/).
import { mkdirSync, existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import assert from 'node:assert/strict';
import { launchChromium } from './browser.mjs';
import { startServer } from './server.mjs';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const DIST = process.env.BUFFERWRIGHT_DIST || join(ROOT, 'dist');
export const SINGLE_FILE = join(ROOT, 'dist-single', 'bufferwright.html');
export const ARTIFACTS = join(ROOT, 'tests', 'artifacts');
export const AXE_PATH = join(ROOT, 'tests', 'node_modules', 'axe-core', 'axe.min.js');

export const VIEWPORTS = {
  phone: { viewport: { width: 390, height: 844 }, deviceScaleFactor: 3, isMobile: true, hasTouch: true },
  tablet: { viewport: { width: 768, height: 1024 }, deviceScaleFactor: 2 },
  desktop: { viewport: { width: 1366, height: 768 }, deviceScaleFactor: 1 },
};

/** The selector of a `data-testid` hook. */
export const tid = (id) => `[data-testid="${id}"]`;

/** A new page of session `s` at `url`, once the app has mounted. */
export async function openApp(s, url) {
  const page = await s.newPage();
  await page.goto(url);
  await waitForApp(page);
  return page;
}

/** Every local-storage key of the page's origin with its text. */
export async function storageSnapshot(page) {
  return page.evaluate(() => {
    const out = {};
    for (let i = 0; i < localStorage.length; i++) {
      const k = localStorage.key(i);
      out[k] = localStorage.getItem(k);
    }
    return out;
  });
}

/** Selectors the UI provides as stable test hooks. */
export const HOOKS = { root: '#app-root', plot: 'canvas.plot', testid: '[data-testid]' };

/** Serve dist/ (plus /embed-example.html) on a free loopback port. */
export async function serveDist() {
  assert.ok(existsSync(join(DIST, 'index.html')), `${DIST}/index.html missing: run trunk build --release first`);
  return startServer({
    root: DIST,
    aliases: { '/embed-example.html': join(ROOT, 'docs', 'embed-example.html') },
  });
}

/**
 * A browser session with watchers. `allowedOrigin` is the server origin (or 'file://' for the
 * single-file page); data: and blob: URLs never leave the machine and are allowed.
 */
export async function openSession({ allowedOrigin, view = 'desktop', contextOptions = {} } = {}) {
  const browser = await launchChromium();
  const context = await browser.newContext({ ...VIEWPORTS[view], ...contextOptions });
  const consoleErrors = [];
  const foreignRequests = [];
  const failedRequests = [];
  const isLocal = (u) => {
    if (u.startsWith('data:') || u.startsWith('blob:')) return true;
    if (allowedOrigin === 'file://') return u.startsWith('file://');
    try {
      return new URL(u).origin === allowedOrigin;
    } catch {
      return false;
    }
  };
  context.on('request', (req) => {
    if (!isLocal(req.url())) foreignRequests.push(req.url());
  });
  context.on('requestfailed', (req) => {
    // Requests cut on purpose while offline are reported by the offline test itself.
    if (!session.offline) failedRequests.push(`${req.url()} (${req.failure()?.errorText})`);
  });
  // The app names its own icons (index.html), so a request for /favicon.ico is the browser's own
  // for a page outside the app (the embedding sample, a 404 page); its 404 can arrive late, during
  // the next page's start-up, and is never the app's failure.
  const browsersFavicon = (url) => url.endsWith('/favicon.ico');
  context.on('response', (resp) => {
    if (resp.status() >= 400 && !browsersFavicon(resp.url())) failedRequests.push(`${resp.url()} (HTTP ${resp.status()})`);
  });
  const watch = (page) => {
    PAGE_ERRORS.set(page, consoleErrors);
    page.on('console', (msg) => {
      if (msg.type() === 'error' && !browsersFavicon(msg.location()?.url || '')) {
        const at = msg.location()?.url ? ` [${msg.location().url}]` : '';
        consoleErrors.push(`console.error: ${msg.text()}${at}`);
      }
    });
    page.on('pageerror', (err) => consoleErrors.push(`uncaught: ${err.message}`));
  };
  context.on('page', watch);
  // Mark the moment trunk's loader has initialised the wasm module.
  await context.addInitScript(() => {
    window.__bwStarted = false;
    addEventListener('TrunkApplicationStarted', () => {
      window.__bwStarted = true;
    });
  });
  const session = {
    browser,
    context,
    consoleErrors,
    foreignRequests,
    failedRequests,
    offline: false,
    async newPage() {
      return context.newPage();
    },
    async setOffline(offline) {
      session.offline = offline;
      await context.setOffline(offline);
    },
    /** Assert nothing bad was seen so far. */
    assertClean(label = '') {
      const where = label ? ` (${label})` : '';
      assert.deepEqual(consoleErrors, [], `console errors${where}`);
      assert.deepEqual(foreignRequests, [], `requests to other origins${where}`);
      assert.deepEqual(failedRequests, [], `failed requests${where}`);
    },
    async close() {
      await context.close().catch(() => {});
      await browser.close().catch(() => {});
    },
  };
  return session;
}

/** Console errors seen per page (filled by openSession's watchers). */
const PAGE_ERRORS = new WeakMap();

/**
 * Wait until the wasm app has started and mounted something visible. Returns a summary.
 * `page` may be a Page or a Frame. Fails at once, with the messages, if the page logs an error
 * before the app starts (a CSP block or a panic would otherwise only show up as a time-out).
 */
export async function waitForApp(page, { timeout = 30_000 } = {}) {
  const owner = typeof page.page === 'function' ? page.page() : page;
  const errors = PAGE_ERRORS.get(owner) || [];
  const deadline = Date.now() + timeout;
  for (;;) {
    if (errors.length) throw new Error(`app did not start cleanly:\n  ${errors.join('\n  ')}`);
    const started = await page.evaluate(() => window.__bwStarted === true).catch(() => false);
    if (started) break;
    if (Date.now() > deadline) throw new Error(`app did not start within ${timeout} ms (no TrunkApplicationStarted)`);
    await new Promise((r) => setTimeout(r, 100));
  }
  await page.waitForFunction(
    () => {
      const root = document.querySelector('#app-root') || document.body;
      return root && root.innerText.trim().length > 0;
    },
    null,
    { timeout },
  );
  return page.evaluate(() => ({
    hasRoot: !!document.querySelector('#app-root'),
    text: (document.querySelector('#app-root') || document.body).innerText.slice(0, 200),
    canvases: document.querySelectorAll('canvas').length,
    plots: document.querySelectorAll('canvas.plot').length,
    testids: [...document.querySelectorAll('[data-testid]')].map((e) => e.getAttribute('data-testid')),
  }));
}

/**
 * True when the real UI (not the skeleton placeholder) is present: the root element holds at
 * least one data-testid hook. Until then plot checks are skipped with a printed reason.
 */
export async function uiLanded(page) {
  return page.evaluate(() => !!document.querySelector('#app-root [data-testid]'));
}

/**
 * Pixel facts for every visible canvas: CSS size, backing size, DPR and whether it has
 * more than one colour (non-blank).
 */
export async function canvasFacts(page, selector = 'canvas') {
  return page.evaluate((sel) => {
    return [...document.querySelectorAll(sel)]
      .filter((c) => c.getBoundingClientRect().width > 0)
      .map((c) => {
        const r = c.getBoundingClientRect();
        let colours = 0;
        let error = null;
        try {
          const ctx = c.getContext('2d');
          const data = ctx.getImageData(0, 0, c.width, c.height).data;
          const seen = new Set();
          for (let i = 0; i < data.length && seen.size < 3; i += 4 * 7) {
            seen.add((data[i] << 24) | (data[i + 1] << 16) | (data[i + 2] << 8) | data[i + 3]);
          }
          colours = seen.size;
        } catch (e) {
          error = String(e);
        }
        return {
          id: c.id || c.getAttribute('data-testid') || c.className,
          cssWidth: r.width,
          cssHeight: r.height,
          width: c.width,
          height: c.height,
          dpr: window.devicePixelRatio,
          colours,
          error,
        };
      });
  }, selector);
}

/** Assert the canvas backing store is CSS size x devicePixelRatio and that it is not blank. */
export function assertCanvasSharpAndDrawn(facts) {
  for (const f of facts) {
    assert.equal(f.error, null, `canvas ${f.id}: getImageData failed: ${f.error}`);
    assert.ok(
      Math.abs(f.width - Math.round(f.cssWidth * f.dpr)) <= 1,
      `canvas ${f.id}: backing width ${f.width} != CSS width ${f.cssWidth} x DPR ${f.dpr}`,
    );
    assert.ok(
      Math.abs(f.height - Math.round(f.cssHeight * f.dpr)) <= 1,
      `canvas ${f.id}: backing height ${f.height} != CSS height ${f.cssHeight} x DPR ${f.dpr}`,
    );
    assert.ok(f.colours > 1, `canvas ${f.id} is blank (one colour only)`);
  }
}

/**
 * Visit every workspace tab (`[data-testid^="tab-"]` buttons) and gather the visible plots of each.
 * Calls `onTab(name)` after each switch (e.g. for screenshots). Returns [{ tab, plots }].
 */
export async function visitTabs(page, onTab = async () => {}) {
  const tabs = await page.evaluate(() =>
    [...document.querySelectorAll('[data-testid^="tab-"]')].map((e) => e.getAttribute('data-testid')),
  );
  const out = [];
  for (const tab of tabs) {
    await page.click(`[data-testid="${tab}"]`);
    // Plots draw on the next animation frames; give them a moment, then read their pixels.
    let plots = [];
    for (let i = 0; i < 20; i++) {
      await page.waitForTimeout(100);
      plots = await canvasFacts(page, HOOKS.plot);
      if (plots.every((f) => f.colours > 1)) break;
    }
    await onTab(tab);
    out.push({ tab, plots });
  }
  return out;
}

/** Save a full-page screenshot to tests/artifacts/<name>.png and return its path. */
export async function screenshot(page, name) {
  mkdirSync(ARTIFACTS, { recursive: true });
  const path = join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

/**
 * Run axe-core in the page. The context must be created with bypassCSP: true, since axe is
 * injected as an inline script. Returns violations with impact serious or critical.
 */
export async function axeAudit(page, { include = null } = {}) {
  await page.addScriptTag({ path: AXE_PATH });
  const result = await page.evaluate(async (inc) => {
    // eslint-disable-next-line no-undef
    const r = await axe.run(inc || document, { resultTypes: ['violations'] });
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.slice(0, 5).map((n) => n.target.join(' ')),
    }));
  }, include);
  return result.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

export const singleFileUrl = () => pathToFileURL(SINGLE_FILE).href;
