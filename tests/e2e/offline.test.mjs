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
