// Smoke: the release bundle renders at tablet and desktop sizes, logs no errors, talks to no
// other origin, and its plots are drawn at the device's pixel density.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import {
  serveDist,
  openSession,
  waitForApp,
  uiLanded,
  visitTabs,
  assertCanvasSharpAndDrawn,
  screenshot,
  HOOKS,
} from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

for (const view of ['tablet', 'desktop']) {
  test(`renders cleanly at ${view} size`, async (t) => {
    const s = await openSession({ allowedOrigin: srv.origin, view });
    try {
      const page = await s.newPage();
      const resp = await page.goto(srv.url('/'));
      assert.equal(resp.status(), 200);
      const summary = await waitForApp(page);
      t.diagnostic(`app: ${JSON.stringify(summary)}`);
      assert.equal(await page.title(), 'Bufferwright');
      // Let a frame or two pass so canvases are painted and late errors surface.
      await page.waitForTimeout(500);
      const shot = await screenshot(page, `smoke-${view}`);
      t.diagnostic(`screenshot: ${shot}`);
      s.assertClean(view);

      if (!(await uiLanded(page))) {
        t.skip(`UI hooks not present yet: no [data-testid] inside ${HOOKS.root} yet (skeleton UI); canvas checks skipped`);
        console.log(`skip reason: no [data-testid] inside ${HOOKS.root} yet, so plot checks were not run`);
        return;
      }
      // Every workspace tab: screenshot, and every visible plot must be drawn at device resolution.
      const visited = await visitTabs(page, (tab) => screenshot(page, `smoke-${view}-${tab}`));
      const all = visited.flatMap((v) => v.plots.map((f) => ({ ...f, id: `${v.tab}:${f.id}` })));
      t.diagnostic(`plots: ${JSON.stringify(all)}`);
      assert.ok(all.length >= 1, `expected at least one visible ${HOOKS.plot} on some workspace tab`);
      assertCanvasSharpAndDrawn(all);
      if (view === 'tablet') assert.equal(all[0].dpr, 2);
      s.assertClean(`${view}, after visiting every tab`);
    } finally {
      await s.close();
    }
  });
}

test('serves the wasm, manifest and icons with the right types', async () => {
  const html = await (await fetch(srv.url('/'))).text();
  const wasm = html.match(/href="\.\/([^"]+_bg\.wasm)"/)?.[1];
  assert.ok(wasm, 'wasm preload link present in index.html');
  const w = await fetch(srv.url(`/${wasm}`));
  assert.equal(w.headers.get('content-type'), 'application/wasm');
  const m = await fetch(srv.url('/manifest.webmanifest'));
  assert.equal(m.headers.get('content-type'), 'application/manifest+json');
  const manifest = await m.json();
  assert.equal(manifest.name, 'Bufferwright');
  assert.equal(manifest.start_url, '.');
  assert.equal(manifest.display, 'standalone');
  for (const icon of manifest.icons) {
    const r = await fetch(srv.url(`/${icon.src}`));
    assert.equal(r.status, 200, `icon ${icon.src}`);
  }
  // CSP allows trunk's loader by hash, nothing inline by 'unsafe-inline'.
  const csp = html.match(/http-equiv="Content-Security-Policy" content="([^"]+)"/)?.[1] ?? '';
  const scriptSrc = csp.split(';').find((d) => d.trim().startsWith('script-src')) ?? '';
  assert.match(scriptSrc, /'sha256-[A-Za-z0-9+/=]+'/);
  assert.doesNotMatch(scriptSrc, /unsafe-inline/);
  // The service worker was filled in by the post_build hook.
  const sw = await (await fetch(srv.url('/sw.js'))).text();
  assert.doesNotMatch(sw, /__BUFFERWRIGHT_/);
  assert.ok(sw.includes(wasm), 'sw.js precaches the hashed wasm');
});
