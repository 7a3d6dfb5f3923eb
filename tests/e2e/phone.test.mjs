// On a phone the answer stays in view: each workspace's headline answer (data-testid="answer")
// is on screen when the page opens and while the user edits an input further down.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { serveDist, openSession, waitForApp, screenshot, VIEWPORTS } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

const PHONE = VIEWPORTS.phone;

async function answerInView(page) {
  return page.evaluate(() => {
    const el = [...document.querySelectorAll('[data-testid="answer"]')].find((e) => e.offsetParent !== null);
    if (!el) return { ok: false, why: 'no visible answer' };
    const r = el.getBoundingClientRect();
    return { ok: r.top >= 0 && r.bottom <= innerHeight && r.height > 0, why: `${r.top}..${r.bottom} of ${innerHeight}`, text: el.textContent };
  });
}

for (const [ws, lastInput, pattern] of [
  ['recipe', '#recipe-tolerance', /pH \d+\.\d\d at/],
  ['mixture', '#whatif-temp', /pH \d+\.\d\d/],
  ['field', '#field-temp', /%/],
]) {
  test(`phone: the ${ws} answer is in view on opening and while editing further down`, async () => {
    const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet', contextOptions: PHONE });
    try {
      const page = await s.newPage();
      await page.goto(srv.url(`/?ws=${ws}`));
      await waitForApp(page);
      let seen = await answerInView(page);
      assert.ok(seen.ok, `on opening: ${seen.why}`);
      assert.match(seen.text, pattern);
      await screenshot(page, `phone-${ws}-top`);
      // Open the folded inputs, if any, and scroll to an input lower on the page.
      await page.$$eval('details', (ds) => ds.forEach((d) => (d.open = true)));
      await page.locator(lastInput).scrollIntoViewIfNeeded();
      await page.focus(lastInput);
      seen = await answerInView(page);
      assert.ok(seen.ok, `while editing ${lastInput}: ${seen.why}`);
      await screenshot(page, `phone-${ws}-editing`);
      s.assertClean(`phone ${ws}`);
    } finally {
      await s.close();
    }
  });
}
