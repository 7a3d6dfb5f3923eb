//! A tiny W3C WebDriver client (HTTP + JSON, node's own fetch) and the WebKit adapter: Debian's
//! `WebKitWebDriver` starting `MiniBrowser --automation` under `xvfb-run -a`. One driver process
//! serves one session at a time; `GDK_SCALE=2` in its environment gives devicePixelRatio 2.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer } from 'node:net';

export const WEBKIT_DRIVER = process.env.WEBKIT_DRIVER || '/usr/bin/WebKitWebDriver';
export const MINIBROWSER =
  process.env.MINIBROWSER || '/usr/lib/x86_64-linux-gnu/webkit2gtk-4.1/MiniBrowser';
const ELEMENT = 'element-6066-11e4-a52e-4f735466cecf';
const KEYS = { Tab: '\uE004', Enter: '\uE007', Backspace: '\uE003', Control: '\uE009' };

/** A free loopback port (asked of the system, then released). */
function freePort() {
  return new Promise((ok, fail) => {
    const s = createServer();
    s.once('error', fail);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address();
      s.close(() => ok(port));
    });
  });
}

const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

/** One WebDriver HTTP call; throws with the driver's message on an error answer. */
async function call(base, method, path, body, timeoutMs = 120_000) {
  const ctl = new AbortController();
  const timer = setTimeout(() => ctl.abort(), timeoutMs);
  try {
    const r = await fetch(base + path, {
      method,
      headers: body === undefined ? {} : { 'content-type': 'application/json; charset=utf-8' },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: ctl.signal,
    });
    const text = await r.text();
    const json = text ? JSON.parse(text) : {};
    if (!r.ok || (json.value && json.value.error)) {
      const v = json.value || {};
      const err = new Error(`WebDriver ${method} ${path}: ${v.error || r.status}: ${v.message || text}`);
      err.webdriver = v.error;
      throw err;
    }
    return json.value;
  } finally {
    clearTimeout(timer);
  }
}

/**
 * A WebKitWebDriver process under its own virtual display. `scale` 2 starts MiniBrowser with
 * GDK_SCALE=2 (devicePixelRatio 2). Start-up is retried (a loaded machine, a display number taken
 * by another run); nothing after start-up is ever retried.
 */
export async function startWebKitDriver({ scale = 1, attempts = 3 } = {}) {
  for (const p of [WEBKIT_DRIVER, MINIBROWSER, '/usr/bin/xvfb-run']) {
    if (!existsSync(p)) throw new Error(`${p} not found: run scripts/setup.sh (webkit2gtk-driver, xvfb)`);
  }
  let lastErr;
  for (let attempt = 1; attempt <= attempts; attempt++) {
    const port = await freePort();
    const env = { ...process.env, GDK_SCALE: String(scale), GDK_DPI_SCALE: '1' };
    // Own process group, so close() ends xvfb-run, Xvfb, the driver and MiniBrowser together.
    const child = spawn(
      'xvfb-run',
      ['-a', '-s', '-screen 0 3000x2400x24 -nolisten tcp', WEBKIT_DRIVER, `--port=${port}`, '--host=127.0.0.1'],
      { env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let log = '';
    child.stdout.on('data', (d) => (log += d));
    child.stderr.on('data', (d) => (log += d));
    const base = `http://127.0.0.1:${port}`;
    const driver = {
      base,
      child,
      scale,
      log: () => log,
      async close() {
        process.off('exit', kill);
        kill();
      },
    };
    // Detached processes outlive a test process that is cut short: end them on exit too.
    function kill() {
      try {
        process.kill(-child.pid, 'SIGTERM');
      } catch {
        /* already gone */
      }
    }
    process.on('exit', kill);
    const deadline = Date.now() + 60_000;
    let ready = false;
    while (Date.now() < deadline && child.exitCode === null) {
      try {
        const st = await call(base, 'GET', '/status', undefined, 5_000);
        if (st && st.ready) {
          ready = true;
          break;
        }
      } catch {
        /* not listening yet */
      }
      await sleep(250);
    }
    if (ready) return driver;
    lastErr = new Error(`WebKitWebDriver did not start (attempt ${attempt}): ${log.slice(-500)}`);
    await driver.close();
    await sleep(1000);
  }
  throw lastErr;
}

/** Open a session on `driver` (retried: this is engine start-up) and wrap it as a Page. */
export async function webkitSession(driver, { width, height, attempts = 3 }) {
  let sid;
  let lastErr;
  for (let attempt = 1; attempt <= attempts && !sid; attempt++) {
    try {
      const v = await call(driver.base, 'POST', '/session', {
        capabilities: {
          alwaysMatch: {
            browserName: 'MiniBrowser',
            'webkitgtk:browserOptions': { binary: MINIBROWSER, args: ['--automation'] },
          },
        },
      });
      sid = v.sessionId;
    } catch (e) {
      lastErr = e;
      await sleep(2000);
    }
  }
  if (!sid) throw new Error(`no WebKit session after ${attempts} attempts: ${lastErr?.message}`);
  const s = (method, path, body, t) => call(driver.base, method, `/session/${sid}${path}`, body, t);
  await s('POST', '/timeouts', { script: 90_000, pageLoad: 120_000, implicit: 0 });
  // The window's outer size; the page's viewport is what is left inside MiniBrowser's frame.
  await s('POST', '/window/rect', { x: 0, y: 0, width, height });

  const find = async (selector) => {
    const v = await s('POST', '/element', { using: 'css selector', value: selector });
    return v[ELEMENT];
  };
  const keyActions = async (actions) => {
    await s('POST', '/actions', { actions: [{ type: 'key', id: 'keyboard', actions }] });
    await s('DELETE', '/actions');
  };
  /** Run `fn(...args)` in the page; promises are awaited; the result comes back as JSON. */
  const evaluate = async (fn, ...args) => {
    const script =
      'const done = arguments[arguments.length - 1];' +
      `Promise.resolve().then(() => (${fn.toString()}).apply(null, Array.prototype.slice.call(arguments, 0, -1)))` +
      '.then((v) => done({ ok: v === undefined ? null : v }), (e) => done({ err: String(e && e.stack || e) }));';
    const r = await s('POST', '/execute/async', { script, args });
    if (r && 'err' in r) throw new Error(`in page: ${r.err}`);
    return r ? r.ok : null;
  };
  // WebDriver scrolls a target only until its bottom edge shows (block "end"), where a sticky
  // bar can cover it and the click is "intercepted"; a person scrolls it into the middle.
  const centre = (selector) =>
    evaluate((sel) => document.querySelector(sel)?.scrollIntoView({ block: 'center', inline: 'nearest' }), selector);
  return {
    engine: 'webkit',
    async goto(url) {
      await s('POST', '/url', { url });
    },
    async reload() {
      await s('POST', '/refresh', {});
    },
    url: () => s('GET', '/url'),
    evaluate,
    async click(selector) {
      await centre(selector);
      await s('POST', `/element/${await find(selector)}/click`, {});
    },
    /**
     * Focus the field, select what is there (Ctrl+A) and type `text` key by key, all as key
     * actions (WebKitWebDriver drops a whole "send keys" text that holds a modifier).
     */
    async type(selector, text) {
      await centre(selector);
      const el = await find(selector);
      await s('POST', `/element/${el}/click`, {});
      const keys = [{ type: 'keyDown', value: KEYS.Control }, { type: 'keyDown', value: 'a' }, { type: 'keyUp', value: 'a' }, { type: 'keyUp', value: KEYS.Control }];
      for (const ch of text) keys.push({ type: 'keyDown', value: ch }, { type: 'keyUp', value: ch });
      await keyActions(keys);
    },
    async press(key) {
      const value = KEYS[key] || key;
      await keyActions([{ type: 'keyDown', value }, { type: 'keyUp', value }]);
    },
    async screenshot() {
      return Buffer.from(await s('GET', '/screenshot'), 'base64');
    },
    /** A PDF of the page as printed, or null where the driver cannot print. */
    async pdf() {
      try {
        return Buffer.from(await s('POST', '/print', { background: true }), 'base64');
      } catch (e) {
        if (/unknown command|unsupported operation|unknown method/i.test(e.message)) return null;
        throw e;
      }
    },
    // WebDriver classic sees neither requests nor console messages: the journeys fall back to
    // the page's own resource timing and to an error hook installed after each load.
    observes: { requests: false, console: false },
    problems: () => ({ consoleErrors: [], foreignRequests: [], failedRequests: [] }),
    async close() {
      await s('DELETE', '', undefined, 30_000).catch(() => {});
    },
  };
}
