//! Cross-engine: the first answer of each workspace equals the command-line entry's for the
//! demo design; typing the way people type (`1,000` refused with both readings, `7,4`, a unit
//! change after typing) gives the same refusal or result; the plots are drawn (inked pixels,
//! backing store = CSS size × devicePixelRatio) at DPR 1 and 2.
import { before } from 'node:test';
import assert from 'node:assert/strict';
import {
  journey,
  tid,
  text,
  textOf,
  value,
  field,
  retype,
  choose,
  waitFor,
  canvasFacts,
  assertClean,
  screenshot,
} from './kit.mjs';
import { demoDoc, report, num, amount } from './cli.mjs';

let cli;
before(() => {
  cli = report(demoDoc());
});

journey('the first answer of each workspace equals the command line', async ({ serve, open, t }) => {
  const srv = await serve();
  const page = await open(srv.url('/'), { width: 1366, height: 900 });
  const rec = cli.recipe.Ok;
  // Recipe: the exact pH and every amount.
  const ph = await textOf(page, tid('recipe-ph-exact'));
  assert.equal(num(ph).toFixed(2), rec.equilibrium.ph.toFixed(2), 'recipe pH');
  for (const [i, ing] of rec.ingredients.entries()) {
    const shown = amount(await textOf(page, tid(`recipe-ingredient-${i}-amount`)));
    const expected = ing.grams ?? ing.ml;
    assert.equal(shown.kind, ing.grams != null ? 'g' : 'mL', `ingredient ${i} unit`);
    assert.ok(Math.abs(shown.value - expected) <= 6e-4 * Math.abs(expected), `ingredient ${i}: page ${shown.value}, CLI ${expected}`);
  }
  // Mixture.
  await page.click(tid('tab-mixture'));
  const mph = await textOf(page, tid('mixture-ph'));
  assert.equal(num(mph).toFixed(2), cli.mixture.Ok.equilibrium.ph.toFixed(2), 'mixture pH');
  // Species: the plotted composition says its pH.
  await page.click(tid('tab-species'));
  const context = await textOf(page, tid('plot-context'));
  assert.match(context, new RegExp(`pH ${rec.equilibrium.ph.toFixed(2).replace('.', '\\.')}`), `species context: ${context}`);
  // Field: every species' share at the measured pH.
  await page.click(tid('tab-field'));
  const species = cli.field.Ok.species;
  for (const [i, sp] of species.entries()) {
    const shown = num(await textOf(page, tid(`field-fraction-${i}`)));
    const expected = sp.fraction * 100;
    assert.ok(Math.abs(shown - expected) <= 0.01 * expected + 0.06, `field species ${i}: page ${shown} %, CLI ${expected} %`);
  }
  t.diagnostic(await screenshot(page, 'first-answers'));
  await assertClean(page, 'first answers');
});

journey('typing as people type: "1,000" refused, "7,4" read, a unit change after typing', async ({ serve, open }) => {
  const srv = await serve();
  const page = await open(srv.url('/'), { width: 768, height: 1024 });
  const volume = await field(page, 'Final volume');
  const target = await field(page, 'Target pH');
  // inputmode asks touch keyboards for a decimal pad in every engine.
  assert.equal(await page.evaluate((s) => document.querySelector(s).inputMode, volume), 'decimal');

  await retype(page, volume, '1,000');
  const msg = await textOf(page, tid('error-recipe-volume'));
  assert.match(msg, /1000/, `both readings named: ${msg}`);
  assert.match(msg, /1\.0/, `both readings named: ${msg}`);
  assert.equal(await text(page, tid('recipe-ingredient-0-amount')), null, 'no amounts while the volume is refused');

  await retype(page, target, '7,4');
  await retype(page, volume, '1000');
  await waitFor(page, (s) => !!document.querySelector(s), [tid('recipe-ingredient-0-amount')], { what: 'amounts' });
  assert.equal((await textOf(page, tid('recipe-ph-exact'))).trim(), '7.40');
  assert.match(await text(page, tid('recipe-headline')), /1000(\.0)? mL|1(\.0)? L/);

  // A unit change after typing converts the quantity: the amounts stay.
  await retype(page, volume, '250', 'Tab');
  await waitFor(page, (s) => /250(\.0)? mL/.test(document.querySelector(s)?.textContent || ''), [tid('recipe-headline')], { what: '250 mL' });
  const amounts = () =>
    page.evaluate(() =>
      [...document.querySelectorAll('[data-testid^="recipe-ingredient-"][data-testid$="-amount"]')].map((e) => e.textContent.trim()),
    );
  const before = await amounts();
  assert.ok(before.length >= 1);
  await choose(page, 'select[aria-label="Final volume: unit"]', 'L');
  await waitFor(page, (s) => document.querySelector(s).value === '0.25', [volume], { what: 'the volume in L' });
  assert.match(await text(page, tid('recipe-headline')), /250(\.0)? mL/);
  assert.deepEqual(await amounts(), before, 'picking a unit never changes the amounts');
  // 250 L typed on purpose: the page asks to check the unit.
  await retype(page, volume, '250');
  assert.match(await textOf(page, tid('recipe-unit-check')), /Check the unit/);
  assert.equal(await value(page, volume), '250');
  await screenshot(page, 'typing');
  await assertClean(page, 'typing');
});

for (const dpr of [1, 2]) {
  journey(`the plots are drawn at devicePixelRatio ${dpr}`, async ({ serve, open, engine, t }) => {
    const srv = await serve();
    const page = await open(srv.url('/'), { width: 1024, height: 900, dpr });
    assert.equal(await page.evaluate(() => window.devicePixelRatio), dpr, `${engine} runs at DPR ${dpr}`);
    const tabs = await page.evaluate(() =>
      [...document.querySelectorAll('[data-testid^="tab-"]')].map((e) => e.getAttribute('data-testid')),
    );
    assert.ok(tabs.length >= 4, `tabs: ${tabs}`);
    const all = [];
    for (const tab of tabs) {
      await page.click(tid(tab));
      // Plots paint on the next frames: wait until every visible one has ink.
      const facts = await waitFor(
        page,
        () => {
          const cs = [...document.querySelectorAll('canvas.plot')].filter((c) => c.getBoundingClientRect().width > 0);
          return cs.length === 0 || cs.every((c) => c.hasAttribute('data-draw-count')) ? true : null;
        },
        [],
        { what: `plots of ${tab} painted` },
      ).then(() => canvasFacts(page));
      all.push(...facts.map((f) => ({ ...f, tab })));
      await screenshot(page, `plots-${tab}-dpr${dpr}`);
    }
    t.diagnostic(JSON.stringify(all.map((f) => [f.tab, f.id, f.width, f.height, f.colours, f.inked.toFixed(3)])));
    assert.ok(all.length >= 3, `visible plots on the tabs: ${all.length}`);
    for (const f of all) {
      const where = `${f.tab}:${f.id}`;
      assert.equal(f.error, null, `${where}: getImageData: ${f.error}`);
      assert.ok(Math.abs(f.width - Math.round(f.cssWidth * dpr)) <= 1, `${where}: backing ${f.width} != ${f.cssWidth} × ${dpr}`);
      assert.ok(Math.abs(f.height - Math.round(f.cssHeight * dpr)) <= 1, `${where}: backing ${f.height} != ${f.cssHeight} × ${dpr}`);
      assert.ok(f.colours > 2, `${where}: blank (${f.colours} colours)`);
      assert.ok(f.inked > 0.01, `${where}: only ${(f.inked * 100).toFixed(2)} % of the pixels drawn`);
    }
    await assertClean(page, `plots at DPR ${dpr}`);
  });
}
