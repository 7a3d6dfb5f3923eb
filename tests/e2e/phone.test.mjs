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

// The plot legends fit their canvas on a phone: a legend entry too wide for one row moves to the
// next row instead of running off the right edge. (Labels used to be measured in a span in the
// page, whose width the 390 px viewport capped, so a long entry was thought to fit and was cut.)
test('phone: no plot legend runs off the right edge of its canvas', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet', contextOptions: PHONE });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/?ws=species'));
    await waitForApp(page);
    await page.waitForSelector('canvas[data-testid="plot-titration"][data-draw-count]');
    for (const id of ['plot-species', 'plot-capacity', 'plot-titration']) {
      // Ink in the last two device-pixel columns of the top quarter (the legend's rows).
      const ink = await page.evaluate((id) => {
        const c = document.querySelector(`canvas[data-testid="${id}"]`);
        const h = Math.floor(c.height / 4);
        const px = c.getContext('2d').getImageData(c.width - 2, 0, 2, h).data;
        let dark = 0;
        for (let i = 0; i < px.length; i += 4) if (px[i + 3] > 0 && px[i] + px[i + 1] + px[i + 2] < 384) dark++;
        return dark;
      }, id);
      assert.equal(ink, 0, `${id}: ${ink} dark pixels at the right edge of the legend rows`);
    }
    await screenshot(page, 'phone-species-legends');
    s.assertClean('phone legends');
  } finally {
    await s.close();
  }
});
