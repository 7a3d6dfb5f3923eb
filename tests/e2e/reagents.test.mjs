// The user's own reagents end to end: a copy of acetate typed into the reagent editor (with the
// slips users make on the way) gives the library's numbers in the recipe and field workspaces;
// the reagent is exported as a file, found on the shelf after a reload, imported into another
// browser; a bad reagent file is refused whole; a design carrying a reagent this browser's shelf
// does not hold opens, computes (benzoic acid, a published worked example) and notes the
// user's source. Screenshots at phone and desktop sizes.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { serveDist, openSession, waitForApp, screenshot, axeAudit, ARTIFACTS, tid, VIEWPORTS } from './harness.mjs';

/** What is in view (the editor is an overlay, which a full-page shot does not show whole). */
async function viewShot(page, name) {
  const path = join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path });
  return path;
}

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

const PHONE = VIEWPORTS.phone;
const b64url = (s) => Buffer.from(s, 'utf8').toString('base64url');
const ws = (name) => `[data-testid="ws-${name}"]`;

async function openRecipePanel(page) {
  const panel = page.locator(`${ws('recipe')} ${tid('reagent-panel')}`);
  await panel.locator('summary').click();
  return panel;
}

/** Type a same-constants copy of the library's acetate, slips included. */
async function typeAcetate(page) {
  await page.fill('#rg-name', 'My acetate');
  // A half-typed and an ambiguous pK first: each is refused beside its field.
  await page.fill('#rg-step-0-pk', '4.');
  await page.fill('#rg-step-0-pk', '4,756');
  assert.match(await page.textContent(tid('error-rg-step-0-pk')), /could be 4756 or 4\.756/);
  await page.fill('#rg-step-0-pk', '4.756');
  await page.fill('#rg-step-0-dh', '-0,41');
  await page.fill('#rg-step-0-dcp', '-142');
  await page.fill('#rg-tmin', '0');
  await page.fill('#rg-tmax', '60');
  await page.fill('#rg-form-0-name', 'acetic acid (glacial)');
  await page.fill('#rg-form-0-formula', 'C2H4O2');
  await page.click(tid('rg-add-form'));
  await page.fill('#rg-form-1-name', 'sodium acetate');
  await page.fill('#rg-form-1-formula', 'C2H3NaO2');
  await page.fill('#rg-form-1-na', '1');
  await page.fill('#rg-source', 'Copied from the library table for a check');
}

async function recipeNumbers(page) {
  await page.waitForSelector(tid('recipe-ph-exact'));
  const ph = (await page.textContent(tid('recipe-ph-exact'))).trim();
  const amounts = [];
  for (let i = 0; i < 2; i++) {
    amounts.push((await page.textContent(tid(`recipe-ingredient-${i}-amount`))).trim());
  }
  return { ph, amounts };
}

for (const [view, options] of [
  ['desktop', {}],
  ['phone', { contextOptions: PHONE }],
]) {
  test(`a typed copy of acetate gives the library's numbers; export, reload, import (${view})`, async (t) => {
    const s = await openSession({
      allowedOrigin: srv.origin,
      view: 'desktop',
      contextOptions: { acceptDownloads: true, ...(options.contextOptions || {}) },
    });
    try {
      const page = await s.newPage();
      await page.goto(srv.url('/?ws=recipe'));
      await waitForApp(page);
      await openRecipePanel(page);
      await page.click(tid('rg-new'));
      await page.waitForSelector(tid('reagent-editor'));
      // An empty name and missing pK are marked before anything is typed.
      assert.match(await page.textContent(tid('error-rg-name')), /empty/i);
      assert.match(await page.textContent(tid('error-rg-step-0-pk')), /enter a value/i);
      assert.ok(await page.isDisabled(tid('rg-save')), 'cannot add while fields are marked');
      t.diagnostic(`screenshot: ${await viewShot(page, `reagents-editor-empty-${view}`)}`);
      await typeAcetate(page);
      // A charge that does not fit the forms is named at the form.
      await page.fill('#rg-z0', '-1');
      assert.match(await page.textContent(tid('error-rg-form-0-ions')), /charge/);
      await page.fill('#rg-z0', '0');
      assert.match(await page.textContent('#rg-form-1-formula ~ .rg-hint'), /82\.03\d g\/mol/);
      assert.equal((await page.textContent(tid('rg-summary'))).trim(), 'Every field is right.');
      await page.evaluate(() => document.querySelector('.rg-overlay')?.scrollTo(0, 0));
      t.diagnostic(`screenshot: ${await viewShot(page, `reagents-editor-top-${view}`)}`);
      await page.locator('#rg-form-1-formula').scrollIntoViewIfNeeded();
      t.diagnostic(`screenshot: ${await viewShot(page, `reagents-editor-forms-${view}`)}`);
      await page.click(tid('rg-save'));
      await page.waitForSelector(tid('reagent-editor'), { state: 'detached' });
      // The picker selected the new system and marks it as the user's.
      assert.equal(await page.inputValue('#recipe-system'), 'user_my_acetate');
      const label = await page.locator('#recipe-system option:checked').textContent();
      assert.match(label, /your reagent/);
      await page.fill('#recipe-ph', '4.9');
      const mine = await recipeNumbers(page);
      const note = await page.textContent(`${ws('recipe')} ${tid('user-reagent-note')}`);
      assert.match(note, /constants are yours/);
      assert.match(note, /Copied from the library table for a check/);
      t.diagnostic(`screenshot: ${await screenshot(page, `reagents-recipe-${view}`)}`);
      // Species & capacity plot the recipe's solution: same note, no error.
      await page.click(tid('tab-species'));
      await page.waitForSelector(tid('plot-context'));
      assert.match(await page.textContent(`${ws('species')} ${tid('user-reagent-note')}`), /My acetate is your own reagent/);
      t.diagnostic(`screenshot: ${await viewShot(page, `reagents-species-${view}`)}`);
      await page.click(tid('tab-recipe'));
      await page.selectOption('#recipe-system', 'acetate');
      await page.fill('#recipe-ph', '4.9');
      const lib = await recipeNumbers(page);
      assert.deepEqual(mine, lib, 'recipe: same pH and amounts as the library acetate');
      assert.equal(await page.locator(`${ws('recipe')} ${tid('user-reagent-note')}`).count(), 0);

      // Field reading: the same fractions.
      await page.click(tid('tab-field'));
      await page.waitForSelector('#field-system', { state: 'attached' });
      await page.evaluate(() => document.querySelector('details.other-systems')?.setAttribute('open', ''));
      await page.fill('#field-ph', '4.9');
      await page.selectOption('#field-system', 'user_my_acetate');
      await page.waitForSelector(tid('field-fraction-1'));
      const fMine = await page.textContent(tid('field-fraction-1'));
      await page.selectOption('#field-system', 'acetate');
      await page.waitForSelector(tid('field-fraction-1'));
      const fLib = await page.textContent(tid('field-fraction-1'));
      assert.equal(fMine, fLib, 'field: same fraction');

      // Export the reagent from the shelf.
      await page.click(tid('tab-recipe'));
      const panel = await openRecipePanel(page);
      const item = panel.locator(tid('rg-shelf-item')).filter({ hasText: 'My acetate' });
      const [dl] = await Promise.all([page.waitForEvent('download'), item.getByText('Export').click()]);
      assert.equal(dl.suggestedFilename(), 'my-acetate.bwreagent.json');
      const file = await readFile(await dl.path(), 'utf8');
      assert.equal(JSON.parse(file).bufferwright_reagent, 1);

      // Reload: the shelf still holds it.
      await page.reload();
      await waitForApp(page);
      const again = await openRecipePanel(page);
      await again.locator(tid('rg-shelf-item')).filter({ hasText: 'My acetate' }).waitFor();

      // Another browser: a bad file is refused whole; the exported one is read into the editor.
      const other = await openSession({ allowedOrigin: srv.origin, view: 'desktop', ...options });
      try {
        const p2 = await other.newPage();
        await p2.goto(srv.url('/?ws=recipe'));
        await waitForApp(p2);
        const panel2 = await openRecipePanel(p2);
        assert.equal(await panel2.locator(tid('rg-shelf-item')).count(), 0, 'a new browser has an empty shelf');
        const bad = JSON.parse(file);
        bad.reagent.system.steps[0].pk25 = 99;
        await p2.setInputFiles(`${ws('recipe')} ${tid('rg-import')}`, {
          name: 'bad.bwreagent.json',
          mimeType: 'application/json',
          buffer: Buffer.from(JSON.stringify(bad)),
        });
        await p2.waitForSelector(tid('rg-notice'));
        assert.match(await p2.textContent(tid('rg-notice')), /refused as a whole.*step 1, pK at 25 °C: 99/);
        await p2.setInputFiles(`${ws('recipe')} ${tid('rg-import')}`, {
          name: 'my-acetate.bwreagent.json',
          mimeType: 'application/json',
          buffer: Buffer.from(file),
        });
        await p2.waitForSelector(tid('reagent-editor'));
        assert.equal(await p2.inputValue('#rg-step-0-pk'), '4.756');
        await p2.click(tid('rg-save'));
        await panel2.locator(tid('rg-shelf-item')).filter({ hasText: 'My acetate' }).waitFor();
        assert.equal(await p2.inputValue('#recipe-system'), 'user_my_acetate');
        other.assertClean(`${view}, second browser`);
      } finally {
        await other.close();
      }
      s.assertClean(view);
    } finally {
      await s.close();
    }
  });
}

test('a design carrying a reagent missing from this browser opens and computes (benzoic acid)', async (t) => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    // Published check: 0.40 M benzoic acid, Ka 6.3e-5 → pH 2.30 (general-chemistry worked
    // problem; see solver/tests/reagents.rs). Typed as the user's own system.
    const design = {
      schema: 2,
      name: 'Benzoic check',
      recipe: {
        system: 'phosphate', target_ph: 7.4, temperature_c: 25, total_conc_m: 0.05, volume_l: 0.5,
        salts: [], activity: 'davies',
        method: { kind: 'two_forms', acid_form: 'nah2po4_h2o', base_form: 'na2hpo4_7h2o' },
        tolerance_ph: 0.05,
      },
      mixture: {
        temperature_c: 25, activity: 'davies',
        components: [{ system: 'user_benzoic', form: 'acid', conc_m: 0.4 }], additives: [],
      },
      field: { system: 'ammonium', ph: 8.1, temperature_c: 18.5, total: 0.8, total_unit: 'mg_per_l_as', ionic: { kind: 'conductivity', us_cm: 450 } },
      custom_systems: [{
        id: 'user_benzoic', name: 'Benzoic acid', z0: 0,
        steps: [{ pk25: 4.2007, temp: { kind: 'constant' } }],
        species: ['C₆H₅COOH', 'C₆H₅COO⁻'], t_min_c: 15, t_max_c: 35,
        forms: [{ id: 'acid', name: 'benzoic acid', formula: 'C7H6O2', units: 1, counter_ions: [] }],
        source: 'Ka 6.3e-5, a worked problem', hazards: [],
      }],
    };
    const page = await s.newPage();
    await page.goto(srv.url(`/?ws=mixture#d=${b64url(JSON.stringify(design))}`));
    await waitForApp(page);
    await page.waitForSelector(tid('mixture-ph'));
    const ph = Number((await page.textContent(tid('mixture-ph'))).trim());
    assert.ok(Math.abs(ph - 2.3) < 0.02, `benzoic acid pH ${ph}`);
    const note = await page.textContent(`${ws('mixture')} ${tid('user-reagent-note')}`);
    assert.match(note, /Benzoic acid is your own reagent.*Ka 6\.3e-5, a worked problem/);
    const opt = await page.locator(`${ws('mixture')} option[value="user_benzoic"]`).first().textContent();
    assert.match(opt, /your reagent/);
    t.diagnostic(`screenshot: ${await screenshot(page, 'reagents-flask-from-link-desktop')}`);
    s.assertClean('design with a reagent');
  } finally {
    await s.close();
  }
});

test('a published check typed into the editor: 0.40 M benzoic acid in the flask gives pH 2.30', async (t) => {
  // General-chemistry worked problem: 0.40 M benzoic acid, Ka = 6.3e-5 → [H+] = 5.0e-3 M,
  // pH 2.30 (seen on clutchprep.com; benzoic acid is not in the library; pK = 4.20,
  // thermodynamic pKa 4.20 per NIST SRD 46, from memory). ±0.02: see solver/tests/reagents.rs.
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const design = {
      schema: 2,
      name: 'Flask check',
      recipe: {
        system: 'phosphate', target_ph: 7.4, temperature_c: 25, total_conc_m: 0.05, volume_l: 0.5,
        salts: [], activity: 'davies',
        method: { kind: 'two_forms', acid_form: 'nah2po4_h2o', base_form: 'na2hpo4_7h2o' },
        tolerance_ph: 0.05,
      },
      mixture: { temperature_c: 25, activity: 'davies', components: [{ system: 'acetate', conc_m: 0.4 }], additives: [] },
      field: { system: 'ammonium', ph: 8.1, temperature_c: 18.5, total: 0.8, total_unit: 'mg_per_l_as', ionic: { kind: 'conductivity', us_cm: 450 } },
    };
    const page = await s.newPage();
    await page.goto(srv.url(`/?ws=recipe#d=${b64url(JSON.stringify(design))}`));
    await waitForApp(page);
    await openRecipePanel(page);
    await page.click(tid('rg-new'));
    await page.fill('#rg-name', 'Benzoic acid');
    await page.fill('#rg-step-0-pk', '4,20');
    await page.fill('#rg-form-0-name', 'benzoic acid');
    await page.fill('#rg-form-0-formula', 'C7H6O2');
    assert.match(await page.textContent('#rg-form-0-formula ~ .rg-hint'), /122\.12\d g\/mol/);
    await page.fill('#rg-source', 'Ka 6.3e-5 from a worked problem');
    await page.click(tid('rg-save'));
    await page.waitForSelector(tid('reagent-editor'), { state: 'detached' });
    await page.click(tid('tab-mixture'));
    await page.selectOption('#mixture-comp-0-system', 'user_benzoic_acid');
    await page.waitForSelector(tid('mixture-ph'));
    const ph = Number((await page.textContent(tid('mixture-ph'))).trim());
    assert.ok(Math.abs(ph - 2.3) < 0.02, `benzoic acid pH ${ph}`);
    assert.match(await page.textContent(`${ws('mixture')} ${tid('user-reagent-note')}`), /Ka 6\.3e-5 from a worked problem/);
    t.diagnostic(`screenshot: ${await screenshot(page, 'reagents-flask-benzoic-desktop')}`);
    s.assertClean('benzoic typed');
  } finally {
    await s.close();
  }
});

test('a shelf form of your own for a library system: potassium HEPES weighed in the recipe', async (t) => {
  // bypassCSP: axe is injected as an inline script.
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop', contextOptions: { bypassCSP: true } });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/?ws=recipe'));
    await waitForApp(page);
    await page.selectOption('#recipe-system', 'hepes');
    await page.fill('#recipe-temp', '25');
    await page.fill('#recipe-ph', '7.5');
    const before = await recipeNumbers(page);
    await openRecipePanel(page);
    await page.click(tid('rg-new-form'));
    await page.waitForSelector(tid('reagent-editor'));
    assert.match(await page.textContent(`${tid('reagent-editor')} h3`), /HEPES/);
    await page.fill('#rg-form-0-name', 'HEPES potassium salt');
    await page.fill('#rg-form-0-formula', 'C8H17KN2O4S');
    // Two K⁺ per HEPES cannot be: its species carry 0 and −1.
    await page.fill('#rg-form-0-k', '2');
    assert.match(await page.textContent(tid('error-rg-form-0-ions')), /charge/);
    await page.fill('#rg-form-0-k', '1');
    t.diagnostic(`screenshot: ${await viewShot(page, 'reagents-add-form-desktop')}`);
    const violations = await axeAudit(page, { include: '.rg-overlay' });
    assert.deepEqual(violations, [], 'no serious or critical axe violations in the editor');
    await page.click(tid('rg-save'));
    await page.waitForSelector(tid('reagent-editor'), { state: 'detached' });
    assert.match(await page.locator('#recipe-system option:checked').textContent(), /with your shelf forms/);
    await page.selectOption('#recipe-base-form', 'user_hepes_potassium_salt');
    const after = await recipeNumbers(page);
    // Na⁺ and K⁺ are both +1 spectators: same pH; the acid's mass is unchanged, the salt's is
    // weighed from its own formula (276.39 g/mol vs 260.29 for the sodium salt).
    assert.equal(after.ph, before.ph);
    assert.equal(after.amounts[0], before.amounts[0]);
    assert.notEqual(after.amounts[1], before.amounts[1]);
    assert.match(await page.textContent(`${ws('recipe')} ${tid('user-reagent-note')}`), /HEPES potassium salt/);
    // The ± figure (uncertainty budget) knows the added form too.
    assert.doesNotMatch(await page.textContent(ws('recipe')), /Unknown form/);
    assert.match(await page.textContent(ws('recipe')), /pH 7\.50 ± 0\.\d\d/);
    t.diagnostic(`screenshot: ${await screenshot(page, 'reagents-recipe-k-hepes-desktop')}`);
    // The printed sheet carries the user's form and the note that its constants are the user's.
    await page.emulateMedia({ media: 'print' });
    const printed = await page.evaluate(() => {
      const shown = (el) => !!el && el.getClientRects().length > 0 && getComputedStyle(el).visibility !== 'hidden';
      const ws = document.querySelector('[data-testid="ws-recipe"]') || document;
      return {
        note: shown(ws.querySelector('[data-testid="user-reagent-note"]')),
        form: [...ws.querySelectorAll('[data-testid^="recipe-ingredient-"]')].some((e) => shown(e) && /HEPES potassium salt/.test(e.textContent)),
      };
    });
    assert.deepEqual(printed, { note: true, form: true }, 'printed: the user-reagent note and the user form');
    await page.emulateMedia({ media: 'screen' });
    s.assertClean('potassium HEPES');
  } finally {
    await s.close();
  }
});

test('closing the reagent editor keeps what was typed until it is continued or discarded', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/?ws=recipe'));
    await waitForApp(page);
    const panel = await openRecipePanel(page);
    await page.click(tid('rg-new'));
    await page.fill('#rg-name', 'Half-typed citrate');
    await page.fill('#rg-step-0-pk', '3,13');
    await page.click(tid('rg-close'));
    // Kept, said so, and not lost by a trip to another workspace and back.
    await panel.locator(tid('rg-unfinished')).waitFor();
    assert.match(await panel.locator(tid('rg-unfinished')).textContent(), /Half-typed citrate/);
    await page.click(tid('tab-field'));
    await page.click(tid('tab-recipe'));
    const again = await openRecipePanel(page);
    assert.match(await again.locator(tid('rg-unfinished')).textContent(), /Half-typed citrate/);
    // Another editor does not open over it: one unfinished reagent at a time, never replaced.
    await again.locator(tid('rg-new')).click();
    assert.equal(await page.locator('#rg-name').count(), 0);
    assert.match(await again.locator(tid('rg-notice')).textContent(), /unfinished/);
    // Continue brings the typed text back.
    await again.locator(tid('rg-continue')).click();
    assert.equal(await page.inputValue('#rg-name'), 'Half-typed citrate');
    assert.equal(await page.inputValue('#rg-step-0-pk'), '3,13');
    assert.equal(await again.locator(tid('rg-unfinished')).count(), 0);
    // Closed unchanged from where it continued is still unfinished work; Discard drops it.
    await page.click(tid('rg-close'));
    await again.locator(tid('rg-discard')).click();
    assert.equal(await again.locator(tid('rg-unfinished')).count(), 0);
    // An editor closed without typing leaves nothing behind.
    await again.locator(tid('rg-new')).click();
    await page.click(tid('rg-close'));
    assert.equal(await again.locator(tid('rg-unfinished')).count(), 0);
    s.assertClean('unfinished reagent');
  } finally {
    await s.close();
  }
});
