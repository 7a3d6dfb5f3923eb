// Accessibility: axe-core finds no serious or critical violations at tablet and desktop sizes.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { serveDist, openSession, waitForApp, axeAudit } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

for (const view of ['tablet', 'desktop']) {
  test(`no serious or critical axe violations at ${view} size`, async (t) => {
    // bypassCSP: axe is injected as an inline script, which the page's CSP rightly blocks.
    const s = await openSession({ allowedOrigin: srv.origin, view, contextOptions: { bypassCSP: true } });
    try {
      const page = await s.newPage();
      await page.goto(srv.url('/'));
      await waitForApp(page);
      await page.waitForTimeout(300);
      const violations = await axeAudit(page);
      for (const v of violations) t.diagnostic(`${v.impact} ${v.id}: ${v.help} at ${v.nodes.join(' | ')}`);
      assert.deepEqual(
        violations.map((v) => `${v.impact} ${v.id}`),
        [],
        'serious/critical accessibility violations',
      );
      s.assertClean(view);
    } finally {
      await s.close();
    }
  });
}
