//! Cross-engine: after one visit the page reloads with the server gone (its service worker
//! answers), or, in an engine that gives the page no service worker, it says so on the page;
//! and the single file opens from file:// with its plots drawn and nothing else loaded.
import assert from 'node:assert/strict';
import { existsSync, readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { join } from 'node:path';
import { journey, tid, textOf, waitFor, waitForApp, canvasFacts, assertClean, screenshot, ROOT } from './kit.mjs';

const SINGLE = join(ROOT, 'dist-single', 'bufferwright.html');

journey('offline reload after one visit (or a message where the engine keeps no offline copy)', async ({ serve, open, t }) => {
  const srv = await serve();
  const page = await open(srv.url('/'));
  const sw = await page.evaluate(async () => {
    if (!('serviceWorker' in navigator)) return { supported: false };
    const reg = await Promise.race([navigator.serviceWorker.ready, new Promise((r) => setTimeout(() => r(null), 60_000))]);
    if (!reg) return { supported: true, ready: false };
    if (!navigator.serviceWorker.controller) {
      await new Promise((ok) => {
        navigator.serviceWorker.addEventListener('controllerchange', ok, { once: true });
        setTimeout(ok, 30_000);
      });
    }
    return { supported: true, ready: true, controlled: !!navigator.serviceWorker.controller, caches: await caches.keys() };
  });
  t.diagnostic(`service worker: ${JSON.stringify(sw)}`);
  const note = await page.evaluate((s) => document.querySelector(s)?.textContent ?? null, tid('offline-status'));
  if (!sw.supported || !sw.ready) {
    // No offline copy in this engine: the page must say so, never claim to work offline.
    assert.match(note ?? '', /not kept for offline use/i, `the page says it cannot work offline here: ${note}`);
    await screenshot(page, 'offline-unsupported');
    return;
  }
  assert.equal(sw.controlled, true, 'the worker controls the page');
  assert.equal(sw.caches.filter((c) => c.startsWith('bufferwright-')).length, 1, 'exactly one versioned cache');
  await waitFor(page, (s) => /works offline/i.test(document.querySelector(s)?.textContent || ''), [tid('offline-status')], { what: 'the page says it works offline' });
  await assertClean(page, 'online');

  // The server gone (every connection cut): the reload is answered from the cache.
  page.pauseWatch(true);
  await srv.close();
  await page.reload();
  await waitForApp(page);
  assert.match(await textOf(page, tid('recipe-ph-exact')), /^\s*7\.\d\d\s*$/);
  await screenshot(page, 'offline');
  // A deep link with embed parameters is answered by the cached shell too.
  await page.goto(`${srv.origin}/index.html?embed=1&ws=field`);
  await waitForApp(page);
  await waitFor(page, (s) => !!document.querySelector(s), [tid('embed-mode')], { what: 'the embed bar, offline' });
  const seen = await page.evaluate(() => window.__bwSeen || []);
  assert.deepEqual(seen, [], 'no errors offline');
});

journey('the single file from file://: renders, plots drawn, nothing else loaded', async ({ open }) => {
  assert.ok(existsSync(SINGLE), `${SINGLE} missing: run node scripts/single-file.mjs dist dist-single/bufferwright.html`);
  const html = readFileSync(SINGLE, 'utf8');
  assert.doesNotMatch(html, /<script[^>]+src=/);
  const url = pathToFileURL(SINGLE).href;
  const page = await open(url);
  assert.match(await textOf(page, tid('recipe-ph-exact')), /^\s*7\.\d\d\s*$/);
  await page.click(tid('tab-species'));
  const facts = await waitFor(
    page,
    () => {
      const cs = [...document.querySelectorAll('canvas.plot')].filter((c) => c.getBoundingClientRect().width > 0);
      return cs.length > 0 && cs.every((c) => c.hasAttribute('data-draw-count'));
    },
    [],
    { what: 'the species plots painted' },
  ).then(() => canvasFacts(page));
  assert.ok(facts.length >= 1);
  for (const f of facts) assert.ok(f.colours > 2 && f.inked > 0.01, `${f.id} drawn from file:// (${f.colours} colours)`);
  // Storage from file:// (engines differ here): the page either keeps work or says it cannot.
  const kept = await page.evaluate(() => {
    try {
      localStorage.setItem('bufferwright.probe', '1');
      localStorage.removeItem('bufferwright.probe');
      return true;
    } catch {
      return false;
    }
  });
  if (!kept) assert.ok(await page.evaluate((s) => !!document.querySelector(s), tid('storage-alert')), 'no storage from file://: the page says so');
  // No service worker from file://, and the page does not claim one.
  assert.match(await textOf(page, tid('offline-status')), /single file|this file/i);
  await screenshot(page, 'single-file');
  await assertClean(page, 'file://');
});

// A locked-down PC's Firefox with service workers switched off by policy: the page still works
// and says it is not kept for offline use, instead of claiming it works offline.
journey(
  'with service workers switched off by policy, the page says it is not kept for offline use',
  async ({ serve, open }) => {
    const srv = await serve();
    const page = await open(srv.url('/'));
    assert.equal(await page.evaluate(() => 'serviceWorker' in navigator && !!navigator.serviceWorker), false, 'no service worker here');
    const note = await waitFor(page, (s) => document.querySelector(s)?.textContent || null, [tid('offline-status')], { what: 'the offline line' });
    assert.match(note, /not kept for offline use/);
    assert.doesNotMatch(note, /works offline/);
    assert.match(await textOf(page, tid('recipe-ph-exact')), /^\s*7\.\d\d\s*$/, 'and the page works');
    await screenshot(page, 'offline-switched-off');
    await assertClean(page, 'service workers off');
  },
  { only: ['firefox'], options: { prefs: { 'dom.serviceWorkers.enabled': false } } },
);
