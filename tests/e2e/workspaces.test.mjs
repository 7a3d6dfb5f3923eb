// Workspaces end to end, at tablet and desktop sizes: a recipe made each of the three ways shows
// the same masses and volumes as the command-line entry for the same design document; a mixture
// and a what-if; an ammonia field reading; bad values show messages instead of numbers.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { serveDist, openSession, waitForApp, screenshot, ROOT } from './harness.mjs';

const EXAMPLES = ['two-forms.json', 'titrate.json', 'two-stocks.json'].map((f) =>
  join(ROOT, 'solver', 'examples', f),
);

/** The command-line entry's full report for a design document. */
function cli(path) {
  const out = execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', path], {
    cwd: ROOT,
    encoding: 'utf8',
    maxBuffer: 64 * 1024 * 1024,
  });
  return JSON.parse(out);
}

const b64url = (s) => Buffer.from(s, 'utf8').toString('base64url');

/** "733.5 mg" → 0.7335 (g); "14.52 mL" → 14.52 (mL); "850 µL" → 0.85 (mL). */
function parseAmount(text) {
  const m = text.trim().replace(/\u2009|\u00a0/g, ' ').match(/^([0-9.,]+)\s*(g|mg|µg|mL|µL|L)$/);
  assert.ok(m, `amount text "${text}"`);
  const v = Number(m[1].replace(',', '.'));
  const scale = { g: 1, mg: 1e-3, 'µg': 1e-6, mL: 1, 'µL': 1e-3, L: 1e3 }[m[2]];
  return { value: v * scale, kind: ['g', 'mg', 'µg'].includes(m[2]) ? 'g' : 'mL' };
}

let srv;
let reports;
before(async () => {
  srv = await serveDist();
  reports = EXAMPLES.map((p) => ({ path: p, doc: readFileSync(p, 'utf8'), report: cli(p) }));
});
after(async () => {
  await srv?.close();
});

async function openDesign(s, docText, ws = 'recipe') {
  const page = await s.newPage();
  const compact = JSON.stringify(JSON.parse(docText));
  await page.goto(srv.url(`/?ws=${ws}#d=${b64url(compact)}`));
  await waitForApp(page);
  return page;
}

for (const view of ['tablet', 'desktop']) {
  test(`each preparation method matches the command-line entry (${view})`, async (t) => {
    const s = await openSession({ allowedOrigin: srv.origin, view });
    try {
      for (const { path, doc, report } of reports) {
        const rec = report.recipe.Ok;
        assert.ok(rec, `CLI solved ${path}`);
        const page = await openDesign(s, doc);
        await page.waitForSelector('[data-testid="recipe-ph-exact"]');
        const ph = await page.textContent('[data-testid="recipe-ph-exact"]');
        assert.equal(Number(ph.trim()).toFixed(2), rec.equilibrium.ph.toFixed(2), `${path} pH`);
        for (const [i, ing] of rec.ingredients.entries()) {
          const txt = await page.textContent(`[data-testid="recipe-ingredient-${i}-amount"]`);
          const shown = parseAmount(txt);
          const expected = ing.grams ?? ing.ml;
          assert.equal(shown.kind, ing.grams != null ? 'g' : 'mL', `${path} ingredient ${i} unit (${txt})`);
          // The page shows four significant figures.
          assert.ok(
            Math.abs(shown.value - expected) <= 6e-4 * Math.abs(expected),
            `${path} ingredient ${i}: page ${txt}, CLI ${expected}`,
          );
        }
        const name = path.split('/').pop().replace('.json', '');
        t.diagnostic(`screenshot: ${await screenshot(page, `recipe-${name}-${view}`)}`);
        await page.close();
      }
      s.assertClean(view);
    } finally {
      await s.close();
    }
  });

  test(`mixture, what-if and field reading (${view})`, async (t) => {
    const s = await openSession({ allowedOrigin: srv.origin, view });
    try {
      const { doc, report } = reports[0];
      const page = await openDesign(s, doc, 'mixture');
      await page.waitForSelector('[data-testid="mixture-ph"]');
      const ph = (await page.textContent('[data-testid="mixture-ph"]')).trim();
      assert.equal(Number(ph).toFixed(2), report.mixture.Ok.equilibrium.ph.toFixed(2), 'mixture pH');
      const body = await page.textContent('[data-testid="ws-mixture"]');
      for (const key of ['diluted_ph', 'after_acid_ph', 'after_base_ph', 'at_temperature_ph']) {
        const v = report.what_if.Ok[key].toFixed(2);
        assert.ok(body.includes(v), `what-if ${key} ${v} shown`);
      }
      t.diagnostic(`screenshot: ${await screenshot(page, `mixture-${view}`)}`);

      await page.click('[data-testid="tab-field"]');
      await page.waitForSelector('[data-testid="field-fraction-1"]');
      const frac = await page.textContent('[data-testid="field-fraction-1"]');
      const expected = report.field.Ok.species[1].fraction * 100;
      const shown = Number(frac.replace('%', '').replace(',', '.').trim());
      assert.ok(Math.abs(shown - expected) < 0.01 * expected + 0.005, `NH3 % page ${frac}, CLI ${expected}`);
      t.diagnostic(`screenshot: ${await screenshot(page, `field-${view}`)}`);
      s.assertClean(view);
    } finally {
      await s.close();
    }
  });

  test(`bad values show messages, not numbers (${view})`, async (t) => {
    const s = await openSession({ allowedOrigin: srv.origin, view });
    try {
      const page = await openDesign(s, reports[0].doc);
      await page.waitForSelector('#recipe-ph');
      await page.fill('#recipe-ph', '15');
      await page.fill('#recipe-conc', '-5');
      await page.fill('#recipe-volume', '');
      const text = await page.textContent('[data-testid="ws-recipe"]');
      assert.match(text, /between 0 and 14/i, 'pH range message');
      assert.match(text, /negative/i, 'negative message');
      assert.match(text, /enter a value/i, 'empty message');
      assert.equal(await page.locator('[data-testid="recipe-ph-exact"]').count(), 0, 'no pH shown for bad input');
      // A comma decimal mark is accepted.
      await page.fill('#recipe-ph', '7,2');
      await page.fill('#recipe-conc', '50');
      await page.fill('#recipe-volume', '500');
      await page.waitForSelector('[data-testid="recipe-ph-exact"]');
      assert.equal((await page.textContent('[data-testid="recipe-ph-exact"]')).trim(), '7.20');
      t.diagnostic(`screenshot: ${await screenshot(page, `recipe-bad-input-${view}`)}`);
      s.assertClean(view);
    } finally {
      await s.close();
    }
  });
}
