// Offline: after one visit the service worker serves the whole app with no network at all.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { serveDist, openSession, waitForApp, screenshot } from './harness.mjs';

test('reloads and renders offline after the first visit', async (t) => {
  const srv = await serveDist();
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/'));
    await waitForApp(page);
    const cache = await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
      if (!navigator.serviceWorker.controller) {
        await new Promise((ok) => navigator.serviceWorker.addEventListener('controllerchange', ok, { once: true }));
      }
      return caches.keys();
    });
    t.diagnostic(`caches: ${cache.join(', ')}`);
    assert.equal(cache.filter((c) => c.startsWith('bufferwright-')).length, 1, 'exactly one versioned cache');
    s.assertClean('online');

    // Cut the network both ways: browser offline and the server gone.
    await s.setOffline(true);
    await srv.close();
    await page.reload();
    const summary = await waitForApp(page);
    t.diagnostic(`offline app: ${JSON.stringify(summary)}`);
    await screenshot(page, 'offline-tablet');
    // A deep link with embed parameters is answered by the cached shell too.
    await page.goto(`${srv.origin}/index.html?embed=1&ws=field`);
    await waitForApp(page);
    s.assertClean('offline');
  } finally {
    await s.close();
    await srv.close().catch(() => {});
  }
});

test('a new build replaces the cache and deletes the old one', async (t) => {
  // Second "build": a copy of dist/ whose sw.js carries another cache version.
  const { cpSync, mkdtempSync, readFileSync, writeFileSync, rmSync } = await import('node:fs');
  const { tmpdir } = await import('node:os');
  const { join } = await import('node:path');
  const { DIST } = await import('./harness.mjs');
  const { startServer } = await import('./server.mjs');
  const next = mkdtempSync(join(tmpdir(), 'bufferwright-dist-'));
  cpSync(DIST, next, { recursive: true });
  const sw = readFileSync(join(next, 'sw.js'), 'utf8');
  const old = sw.match(/const CACHE_VERSION = '([^']+)'/)?.[1];
  assert.ok(old, 'sw.js has a CACHE_VERSION');
  writeFileSync(join(next, 'sw.js'), sw.replace(`'${old}'`, "'e2e-next-build'"));

  const first = await serveDist();
  const s = await openSession({ allowedOrigin: first.origin, view: 'desktop' });
  let second;
  try {
    const page = await s.newPage();
    await page.goto(first.url('/'));
    await waitForApp(page);
    const before = await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
      return caches.keys();
    });
    assert.deepEqual(before, [`bufferwright-${old}`]);
    // Same origin (same port), new files: the browser finds the changed sw.js on reload.
    await first.close();
    second = await startServer({ root: next, port: first.port });
    await page.reload();
    await waitForApp(page);
    await page.evaluate(() => navigator.serviceWorker.getRegistration().then((r) => r && r.update()));
    await page.waitForFunction(
      async () => {
        const keys = await caches.keys();
        return keys.length === 1 && keys[0] === 'bufferwright-e2e-next-build';
      },
      null,
      { timeout: 20_000, polling: 200 },
    );
    t.diagnostic(`cache ${old} replaced by e2e-next-build`);
    s.assertClean('update');
  } finally {
    await s.close();
    await first.close().catch(() => {});
    await second?.close();
    rmSync(next, { recursive: true, force: true });
  }
});
