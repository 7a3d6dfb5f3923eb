// Embedding: docs/embed-example.html (served at /embed-example.html) shows the app in an iframe
// with ?embed=1&ws=field. The app marks embed mode with data-testid="embed-mode".
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { serveDist, openSession, waitForApp, screenshot } from './harness.mjs';

test('embed sample page shows the app in embed mode', async (t) => {
  const srv = await serveDist();
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await s.newPage();
    const resp = await page.goto(srv.url('/embed-example.html'));
    assert.equal(resp.status(), 200);
    const handle = await page.waitForSelector('iframe#bufferwright');
    const frame = await handle.contentFrame();
    assert.ok(frame, 'iframe has a frame');
    assert.match(frame.url(), /index\.html\?embed=1&ws=field/);
    await waitForApp(frame);
    await page.waitForTimeout(300);
    await screenshot(page, 'embed-desktop');
    s.assertClean('embed');
    const marked = await frame.evaluate(() => !!document.querySelector('[data-testid="embed-mode"]'));
    if (!marked) {
      const reason = 'app has no [data-testid="embed-mode"] yet: embed mode not implemented in the UI';
      console.log(`skip reason: ${reason}`);
      t.skip(reason);
      return;
    }
    const ws = await frame.evaluate(
      () => document.querySelector('[data-testid="embed-mode"]').getAttribute('data-workspace') || '',
    );
    t.diagnostic(`embed workspace attribute: '${ws}'`);
    assert.equal(ws, 'field', 'ws=field opens the field workspace');
  } finally {
    await s.close();
    await srv.close();
  }
});
