//! One engine-neutral page interface for the cross-engine journeys, with three adapters:
//! Chromium (playwright-core, as tests/e2e/browser.mjs), Firefox (puppeteer-core over WebDriver
//! BiDi, Debian's firefox-esr) and WebKit (plain W3C WebDriver, Debian's WebKitWebDriver with
//! MiniBrowser under xvfb-run). No adapter downloads a browser.
//!
//! Page: goto(url), reload(), url(), evaluate(fn, ...args) (fn runs in the page; promises are
//! awaited; JSON comes back), click(css), type(css, text) (select all, then key by key),
//! press('Tab' | 'Enter' | 'Backspace'), screenshot() → PNG bytes, pdf() → PDF bytes or null,
//! observes { requests, console }, problems() → what the engine let us see, close().
//! Engine: name, newPage({ width, height, dpr }) (a fresh, isolated profile or context), close().
import { existsSync } from 'node:fs';
import { launchChromium } from '../e2e/browser.mjs';
import { startWebKitDriver, webkitSession } from './webdriver.mjs';

export const FIREFOX_PATH = process.env.FIREFOX_PATH || '/usr/bin/firefox-esr';

/** The engines to run, from BW_ENGINES (comma-separated); all three by default. */
export const ENGINES = (process.env.BW_ENGINES || 'chromium,firefox,webkit')
  .split(',')
  .map((e) => e.trim())
  .filter(Boolean);

const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

/** Engine start-up only is retried (a loaded 2-core machine); assertions never are. */
async function startWithRetry(what, fn, attempts = 3) {
  let last;
  for (let i = 1; i <= attempts; i++) {
    try {
      return await fn();
    } catch (e) {
      last = e;
      console.log(`# ${what} start-up attempt ${i} failed: ${e.message.split('\n')[0]}`);
      await sleep(2000 * i);
    }
  }
  throw new Error(`${what} did not start after ${attempts} attempts: ${last?.message}`);
}

/** `fn(...args)` as one expression (evaluated by the protocol, so the page's CSP does not apply). */
const expression = (fn, args) => `(${fn.toString()}).apply(null, ${JSON.stringify(args)})`;

/** Watchers shared by the two adapters whose engines report requests and console messages. */
function watchers(origin) {
  const w = { consoleErrors: [], foreignRequests: [], failedRequests: [], paused: false };
  w.isLocal = (u) => {
    if (u.startsWith('data:') || u.startsWith('blob:') || u.startsWith('about:')) return true;
    if (origin === 'file://') return u.startsWith('file://');
    try {
      return new URL(u).origin === origin;
    } catch {
      return false;
    }
  };
  w.request = (u) => {
    if (!w.isLocal(u)) w.foreignRequests.push(u);
  };
  w.failed = (u, why) => {
    // Requests cut on purpose (the offline journey stops the server) are that journey's business.
    if (!w.paused && !u.endsWith('/favicon.ico')) w.failedRequests.push(`${u} (${why})`);
  };
  w.console = (type, text, url = '') => {
    if (type === 'error' && !url.endsWith('/favicon.ico') && !w.paused) w.consoleErrors.push(`console.error: ${text}`);
  };
  w.problems = () => ({
    consoleErrors: [...w.consoleErrors],
    foreignRequests: [...w.foreignRequests],
    failedRequests: [...w.failedRequests],
  });
  return w;
}

async function chromiumEngine() {
  const browser = await startWithRetry('chromium', () => launchChromium());
  return {
    name: 'chromium',
    async newPage({ width = 1366, height = 900, dpr = 1, origin } = {}) {
      const context = await browser.newContext({ viewport: { width, height }, deviceScaleFactor: dpr });
      const page = await context.newPage();
      const w = watchers(origin);
      context.on('request', (r) => w.request(r.url()));
      context.on('requestfailed', (r) => w.failed(r.url(), r.failure()?.errorText));
      context.on('response', (r) => r.status() >= 400 && w.failed(r.url(), `HTTP ${r.status()}`));
      page.on('console', (m) => w.console(m.type(), m.text(), m.location()?.url || ''));
      page.on('pageerror', (e) => !w.paused && w.consoleErrors.push(`uncaught: ${e.message}`));
      return {
        engine: 'chromium',
        goto: (url) => page.goto(url, { timeout: 120_000 }),
        reload: () => page.reload({ timeout: 120_000 }),
        url: async () => page.url(),
        evaluate: (fn, ...args) => page.evaluate(expression(fn, args)),
        click: (sel) => page.click(sel, { timeout: 60_000 }),
        async type(sel, text) {
          await page.click(sel, { timeout: 60_000 });
          await page.keyboard.press('Control+A');
          await page.keyboard.type(text);
        },
        press: (key) => page.keyboard.press(key),
        screenshot: () => page.screenshot({ fullPage: true }),
        pdf: () => page.pdf({ format: 'A4' }),
        observes: { requests: true, console: true },
        problems: w.problems,
        pauseWatch: (p) => (w.paused = p),
        close: () => context.close().catch(() => {}),
      };
    },
    close: () => browser.close().catch(() => {}),
  };
}

async function firefoxEngine({ prefs = {} } = {}) {
  if (!existsSync(FIREFOX_PATH)) throw new Error(`${FIREFOX_PATH} not found: run scripts/setup.sh (firefox-esr)`);
  process.env.PUPPETEER_SKIP_DOWNLOAD = '1';
  const { default: puppeteer } = await import('puppeteer-core');
  const browser = await startWithRetry('firefox', () =>
    puppeteer.launch({
      browser: 'firefox',
      executablePath: FIREFOX_PATH,
      headless: true,
      protocolTimeout: 180_000,
      timeout: 120_000,
      // Quiet: no update, telemetry or safe-browsing traffic of the browser's own.
      extraPrefsFirefox: {
        'app.update.enabled': false,
        'browser.safebrowsing.malware.enabled': false,
        'browser.safebrowsing.phishing.enabled': false,
        'datareporting.policy.dataSubmissionEnabled': false,
        'network.captive-portal-service.enabled': false,
        'network.connectivity-service.enabled': false,
        ...prefs,
      },
    }),
  );
  return {
    name: 'firefox',
    async newPage({ width = 1366, height = 900, dpr = 1, origin } = {}) {
      const context = await browser.createBrowserContext();
      const page = await context.newPage();
      page.setDefaultTimeout(60_000);
      page.setDefaultNavigationTimeout(120_000);
      await page.setViewport({ width, height, deviceScaleFactor: dpr });
      const w = watchers(origin);
      page.on('request', (r) => w.request(r.url()));
      page.on('requestfailed', (r) => w.failed(r.url(), r.failure()?.errorText));
      page.on('response', (r) => r.status() >= 400 && w.failed(r.url(), `HTTP ${r.status()}`));
      page.on('console', (m) => w.console(m.type(), m.text(), m.location()?.url || ''));
      page.on('pageerror', (e) => !w.paused && w.consoleErrors.push(`uncaught: ${e.message}`));
      return {
        engine: 'firefox',
        goto: (url) => page.goto(url),
        reload: () => page.reload(),
        url: async () => page.url(),
        evaluate: (fn, ...args) => page.evaluate(expression(fn, args)),
        click: (sel) => page.click(sel),
        async type(sel, text) {
          await page.click(sel);
          await page.keyboard.down('Control');
          await page.keyboard.press('a');
          await page.keyboard.up('Control');
          await page.keyboard.type(text);
        },
        press: (key) => page.keyboard.press(key),
        screenshot: () => page.screenshot({ fullPage: true }),
        pdf: () => page.pdf({ format: 'A4', printBackground: true }),
        observes: { requests: true, console: true },
        problems: w.problems,
        pauseWatch: (p) => (w.paused = p),
        close: () => context.close().catch(() => {}),
      };
    },
    close: () => browser.close().catch(() => {}),
  };
}

async function webkitEngine() {
  // One WebKitWebDriver serves one session at a time: a pool, per devicePixelRatio.
  const drivers = [];
  const take = async (dpr) => {
    let d = drivers.find((x) => x.scale === dpr && !x.busy);
    if (!d) {
      d = await startWebKitDriver({ scale: dpr });
      drivers.push(d);
    }
    d.busy = true;
    return d;
  };
  (await take(1)).busy = false;
  return {
    name: 'webkit',
    async newPage({ width = 1366, height = 900, dpr = 1 } = {}) {
      const driver = await take(dpr);
      let page;
      try {
        // MiniBrowser's frame takes some height; the window is given a little more.
        page = await webkitSession(driver, { width, height: height + 40 });
      } catch (e) {
        driver.busy = false;
        throw e;
      }
      const close = page.close;
      page.close = async () => {
        await close();
        driver.busy = false;
      };
      page.pauseWatch = () => {};
      return page;
    },
    async close() {
      for (const d of drivers) await d.close();
    },
  };
}

/**
 * Start an engine by name. `options.prefs` are Firefox preferences (as a locked-down PC's
 * policy sets them), for the journeys that check how the page degrades.
 */
export async function launchEngine(name, options = {}) {
  if (name === 'chromium') return chromiumEngine();
  if (name === 'firefox') return firefoxEngine(options);
  if (name === 'webkit') return webkitEngine();
  throw new Error(`unknown engine ${name} (chromium, firefox, webkit)`);
}
