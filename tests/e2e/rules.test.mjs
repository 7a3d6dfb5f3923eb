// One set of rules on the newer screens (issue 20, items 4 to 12): a form's formula against its
// counter-ions, titrations that fit the flask, nothing kept that the page's own reader refuses
// and one bad workspace not costing the others on reload, the day's log and an unfinished reagent
// kept, plain words, the address links point at, the reagent editor's rough edges, the printed
// caution before the NaOH step, the ±5 °C curves apart, the ± table on a phone, and subscripts
// only in formulas. Each journey failed on the build before these fixes.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import {
  ROOT,
  ARTIFACTS,
  serveDist,
  openSession,
  openApp,
  waitForApp,
  tid,
  storageSnapshot,
  singleFileUrl,
} from './harness.mjs';

let srv;
let demo;
before(async () => {
  srv = await serveDist();
  demo = JSON.parse(
    execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', '--demo'], { cwd: ROOT, encoding: 'utf8' }),
  );
});
after(async () => {
  await srv?.close();
});

const ws = (name) => `[data-testid="ws-${name}"]`;
const doc = () => JSON.parse(JSON.stringify(demo));
/** A link in the first format: `#d=` and the base64url of the compact JSON. */
const link = (d) => srv.url('/') + `#d=${Buffer.from(JSON.stringify(d), 'utf8').toString('base64url')}`;
const messages = (page) => page.$$eval('[data-testid="storage-message"]', (els) => els.map((e) => e.textContent).join('\n'));

function titrated(d, { total, factor, titrantM = 1 }) {
  d.recipe.system = 'tris';
  d.recipe.target_ph = 7.6;
  d.recipe.temperature_c = 25;
  d.recipe.total_conc_m = total;
  d.recipe.volume_l = 0.5;
  delete d.recipe.prepare_temperature_c;
  if (factor > 1) d.recipe.concentrate_factor = factor;
  d.recipe.method = { kind: 'titrate', form: 'tris_hcl', titrant: 'naoh', titrant_m: titrantM };
  return d;
}

async function openEditor(page) {
  const panel = page.locator(`${ws('recipe')} ${tid('reagent-panel')}`);
  if (!(await panel.evaluate((d) => d.open))) await panel.locator('summary').click();
  await page.click(`${ws('recipe')} ${tid('rg-new')}`);
  await page.waitForSelector(tid('reagent-editor'));
  return panel;
}

test('item 4: a sodium salt typed with no Na⁺ is refused, naming the element', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await openEditor(page);
    await page.fill('#rg-name', 'Benzoic (my own)');
    await page.fill('#rg-step-0-pk', '4.20');
    await page.fill('#rg-form-0-name', 'sodium benzoate');
    await page.fill('#rg-form-0-formula', 'C7H5NaO2');
    await page.waitForSelector(tid('error-rg-form-0-ions'));
    assert.match(await page.textContent(tid('error-rg-form-0-ions')), /holds 1 Na.*declare 0 Na⁺/);
    assert.ok(await page.isDisabled(tid('rg-save')), 'not accepted');
    await page.fill('#rg-form-0-na', '1');
    await page.waitForSelector(tid('error-rg-form-0-ions'), { state: 'detached' });
    assert.equal((await page.textContent(tid('rg-summary'))).trim(), 'Every field is right.');
    s.assertClean('formula against counter-ions');
  } finally {
    await s.close();
  }
});

test('item 5: a titration whose liquids would overfill the flask dissolves in less water, or is refused', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    for (const [total, factor] of [[0.05, 50], [1, 1]]) {
      const page = await openApp(s, link(titrated(doc(), { total, factor })));
      await page.waitForSelector(tid('recipe-steps'));
      const steps = await page.textContent(tid('recipe-steps'));
      const dissolve = Number(/Dissolve in about ([\d.]+) mL/.exec(steps)?.[1]);
      const add = Number(/Add (?:exactly )?([\d.]+) mL of 1\.00 M NaOH/.exec(steps)?.[1]);
      assert.ok(dissolve > 0 && add > 0, steps);
      assert.ok(dissolve + add <= 500, `${total} M ×${factor}: ${dissolve} mL + ${add} mL must fit 500 mL (${steps})`);
      assert.match(steps, /less than the usual 400 mL/);
      await page.close();
    }
    // Even a quarter of the flask cannot fit beside 0.5 M NaOH: refused, naming a titrant that fits.
    const page = await openApp(s, link(titrated(doc(), { total: 0.05, factor: 50, titrantM: 0.5 })));
    await page.waitForSelector(tid('recipe-error'));
    assert.match(await page.textContent(tid('recipe-error')), /stronger titrant \(about [\d.]+ M or more\)/);
    s.assertClean('titration volumes');
  } finally {
    await s.close();
  }
});

test('item 6: nothing the reader refuses is kept; states the reader judged too strictly open; one bad workspace costs nothing else', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    // Tris prepared at 55 °C and a limit left set without a total: documents that open.
    const hot = doc();
    hot.name = 'Hot Tris';
    hot.recipe.system = 'tris';
    hot.recipe.method = { kind: 'two_forms', acid_form: 'tris_hcl', base_form: 'tris_base' };
    hot.recipe.prepare_temperature_c = 55;
    let page = await openApp(s, link(hot));
    assert.match(await page.textContent(tid('design-name')), /Hot\ Tris$/);
    await page.waitForSelector(tid('recipe-error'));
    assert.match(await page.textContent(tid('recipe-error')), /preparation temperature|55/);
    await page.close();
    const field = doc();
    field.name = 'Limit kept';
    field.field.system = 'ammonium';
    field.field.total = null;
    field.field.limit = { value: 0.02, unit: 'mg_per_l_nh3' };
    delete field.field.alkalinity;
    page = await openApp(s, link(field));
    assert.match(await page.textContent(tid('design-name')), /Limit\ kept$/);
    await page.close();

    // A duplicate salt row: refused beside the row, not kept, not saved, not exported.
    page = await openApp(s, srv.url('/'));
    await page.fill(tid('design-name-input'), 'Rules journey');
    await page.waitForFunction(() => Object.keys(localStorage).some((k) => k.startsWith('bufferwright.tabdraft.') && localStorage.getItem(k).includes('Rules journey')));
    await page.click('details.more > summary');
    await page.click(tid('recipe-add-salt'));
    await page.click(tid('recipe-add-salt'));
    await page.selectOption('#recipe-salt-1-kind', 'nacl');
    const dup = await page.textContent(tid('error-recipe-salt-1-kind'));
    assert.match(dup, /refused, not merged/, 'the message agrees with the rule');
    assert.doesNotMatch(dup, /merge them|salts\[/);
    await page.waitForFunction(() => /NOT kept/.test(document.querySelector('[data-testid="designs-panel"]').textContent));
    await page.click(tid('save-design'));
    assert.match(await messages(page), /Not saved: the Recipe, salt row 2: NaCl is listed twice/);
    const draft = Object.entries(await storageSnapshot(page)).find(([k]) => k.startsWith('bufferwright.tabdraft.'));
    assert.equal(JSON.parse(draft[1]).design.recipe.salts.length, 2, 'the stored draft is the last readable state');
    await page.reload();
    await waitForApp(page);
    assert.match(await page.textContent(tid('design-name')), /Rules\ journey$/, 'the draft survives the reload');

    // A stored draft whose recipe the reader refuses: the other workspaces come back.
    await page.evaluate(() => {
      const k = Object.keys(localStorage).find((x) => x.startsWith('bufferwright.tabdraft.'));
      const d = JSON.parse(localStorage.getItem(k));
      d.design.name = 'Salvage me';
      d.design.field.ph = 6.1;
      d.design.recipe.salts = [{ additive: 'kcl', conc_m: 0.01 }, { additive: 'kcl', conc_m: 0.02 }];
      d.dirty = true;
      localStorage.setItem(k, JSON.stringify(d));
    });
    await page.reload();
    await waitForApp(page);
    assert.match(await page.textContent(tid('design-name')), /Salvage\ me$/, 'not replaced by the demo');
    const msg = await messages(page);
    assert.match(msg, /could not be read back: Recipe/);
    assert.doesNotMatch(msg, /bufferwright\.|salts\[/, `plain words: ${msg}`);
    await page.click(tid('tab-field'));
    assert.equal(await page.inputValue('#field-ph'), '6.1');
    s.assertClean('one set of rules');
  } finally {
    await s.close();
  }
});

const LOG = 'time,pH,temp\n08:00,7.9,18\n09:00,8.3,19\n10:00,8.6,21\n';

test("item 7: the day's log stays across workspace visits and a reload", async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await page.click(tid('tab-field'));
    await page.fill(tid('field-log-text'), LOG);
    await page.click(tid('field-log-read'));
    await page.waitForSelector(tid('field-log-counts'));
    await page.selectOption(tid('field-log-col-0'), 'none');
    await page.waitForSelector(tid('field-log-counts'));
    const counts = await page.textContent(tid('field-log-counts'));
    const check = async (when) => {
      await page.click(tid('tab-field'));
      await page.waitForSelector(tid('field-log-counts'));
      assert.equal(await page.inputValue(tid('field-log-text')), LOG, `${when}: the pasted text`);
      assert.equal(await page.textContent(tid('field-log-counts')), counts, `${when}: the results`);
      assert.equal(await page.inputValue(tid('field-log-col-0')), 'none', `${when}: the column choice`);
    };
    await page.click(tid('tab-recipe'));
    await check('after another workspace');
    await page.reload();
    await waitForApp(page);
    await check('after a reload');
    s.assertClean('day log kept');
  } finally {
    await s.close();
  }
});

test('item 8: an unfinished reagent survives a reload', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await openEditor(page);
    await page.fill('#rg-name', 'Half typed amine');
    await page.fill('#rg-step-0-pk', '9.1');
    await page.waitForTimeout(100);
    await page.reload();
    await waitForApp(page);
    const panel = page.locator(`${ws('recipe')} ${tid('reagent-panel')}`);
    await panel.locator('summary').click();
    await panel.locator(tid('rg-unfinished')).waitFor();
    await panel.locator(tid('rg-continue')).click();
    await page.waitForSelector(tid('reagent-editor'));
    assert.equal(await page.inputValue('#rg-name'), 'Half typed amine');
    assert.equal(await page.inputValue('#rg-step-0-pk'), '9.1');
    s.assertClean('unfinished reagent kept');
  } finally {
    await s.close();
  }
});

test('item 9: messages in plain words (concentrate, import)', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const d = doc();
    d.recipe.system = 'tris';
    d.recipe.method = { kind: 'two_forms', acid_form: 'tris_hcl', base_form: 'tris_base' };
    d.recipe.total_conc_m = 1;
    d.recipe.concentrate_factor = 10;
    const page = await openApp(s, link(d));
    await page.waitForSelector(tid('recipe-error'));
    const e = await page.textContent(tid('recipe-error'));
    assert.match(e, /all its forms together/);
    assert.doesNotMatch(e, /tris \(buffer total\)/);
    const bad = doc();
    bad.recipe.target_ph = 99;
    await page.setInputFiles(tid('import-file'), { name: 'bad.bwdesign.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad)) });
    await page.waitForFunction(() => /not imported/.test(document.querySelector('[data-testid="storage-message"]')?.textContent ?? ''));
    const m = await messages(page);
    assert.match(m, /the Recipe, target pH/);
    assert.doesNotMatch(m, /recipe\.target_ph/);
    s.assertClean('plain words');
  } finally {
    await s.close();
  }
});

test('item 10: the single-file page says its links only open here, and takes the address it is served from', async () => {
  const s = await openSession({ allowedOrigin: 'file://', view: 'desktop' });
  try {
    const page = await s.newPage();
    await page.goto(singleFileUrl());
    await waitForApp(page);
    assert.match(await page.inputValue(tid('share-link')), /^file:\/\//);
    assert.match(await page.textContent(tid('share-local-note')), /only works on this computer/);
    await page.fill(tid('page-address'), 'lab.example.org');
    await page.press(tid('page-address'), 'Enter');
    assert.match(await page.textContent(tid('error-page-address')), /https:\/\//);
    await page.fill(tid('page-address'), 'https://lab.example.org/bufferwright/');
    await page.press(tid('page-address'), 'Enter');
    await page.waitForFunction(() => document.querySelector('[data-testid="share-link"]').value.startsWith('https://lab.example.org/bufferwright/#z='));
    assert.equal(await page.$(tid('share-local-note')), null);
    await page.reload();
    await waitForApp(page);
    assert.match(await page.inputValue(tid('share-link')), /^https:\/\/lab\.example\.org\/bufferwright\/#z=/, 'kept in this browser');
    assert.match(await page.textContent(tid('sheet-link')), /^https:\/\/lab\.example\.org/);
  } finally {
    await s.close();
  }
});

test('item 11: the reagent editor: range covers 37 °C, plain messages, Escape, library names, long names, plain import errors, Use never replaces silently', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    const panel = await openEditor(page);
    assert.ok(Number(await page.inputValue('#rg-tmin')) <= 37 && Number(await page.inputValue('#rg-tmax')) >= 37, 'the default range covers 37 °C');
    await page.fill('#rg-tmin', '60');
    await page.fill('#rg-tmax', '0');
    assert.match(await page.textContent(tid('error-rg-tmax')), /must be above the lowest \(60 °C\)/);
    await page.fill('#rg-name', 'Phosphate');
    assert.match(await page.textContent(tid('error-rg-name')), /library system/);
    await page.fill('#rg-name', 'x'.repeat(5000));
    assert.match(await page.textContent(tid('error-rg-name')), /at most 80/);
    await page.keyboard.press('Escape');
    await page.waitForSelector(tid('reagent-editor'), { state: 'detached' });
    await panel.locator(tid('rg-discard')).click();
    // A reagent file cut short: plain words.
    await page.setInputFiles(`${ws('recipe')} ${tid('rg-import')}`, { name: 'cut.bwreagent.json', mimeType: 'application/json', buffer: Buffer.from('{"bufferwright_reagent": 1, "reagent": {"system": {"id": ') });
    await page.waitForSelector(tid('rg-notice'));
    assert.doesNotMatch(await page.textContent(tid('rg-notice')), /EOF|expected|f64/);
    // Add "Mine" (pK 4.20), then make the shelf's copy differ (pK 4.50): Use refuses, naming it.
    await page.click(`${ws('recipe')} ${tid('rg-new')}`);
    await page.waitForSelector(tid('reagent-editor'));
    await page.fill('#rg-name', 'Mine');
    await page.fill('#rg-step-0-pk', '4.20');
    await page.fill('#rg-form-0-name', 'mine acid');
    await page.fill('#rg-form-0-formula', 'C7H6O2');
    await page.click(tid('rg-save'));
    await page.waitForSelector(tid('reagent-editor'), { state: 'detached' });
    await page.evaluate(() => {
      const k = Object.keys(localStorage).find((x) => x.startsWith('bufferwright.reagent.') && localStorage.getItem(x).includes('"Mine"'));
      const before = localStorage.getItem(k);
      const after = before.replace(/"pk25":\s*4\.2\b/, '"pk25": 4.5');
      if (after === before) throw new Error(`no pK 4.2 in the shelf entry: ${before}`);
      localStorage.setItem(k, after);
    });
    await page.reload();
    await waitForApp(page);
    const p2 = page.locator(`${ws('recipe')} ${tid('reagent-panel')}`);
    await p2.locator('summary').click();
    await p2.locator(tid('rg-shelf-item')).filter({ hasText: 'Mine' }).getByRole('button', { name: 'Use' }).click();
    assert.match(await p2.locator(tid('rg-notice')).textContent(), /Not used.*4\.2 here, 4\.5 on the shelf/);
    s.assertClean('reagent editor');
  } finally {
    await s.close();
  }
});

test('item 12: caution before the NaOH step on page 1, ±5 °C curves apart, the ± table on a phone, no subscripts in names', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    // The sheet of a titrated recipe: the hydroxide caution on page 1, before the step adding NaOH.
    const page = await openApp(s, link(titrated(doc(), { total: 0.05, factor: 1 })));
    await page.waitForSelector(tid('recipe-steps'));
    await page.waitForSelector(tid('sheet-qr-svg'), { state: 'attached' });
    const dir = join(ARTIFACTS, 'rules');
    mkdirSync(dir, { recursive: true });
    const pdf = join(dir, 'titrated-A4.pdf');
    await page.pdf({ path: pdf, format: 'A4' });
    const text = execFileSync('pdftotext', [pdf, '-'], { encoding: 'utf8' });
    const first = text.split('\f')[0];
    const caution = first.indexOf('Hydroxide (NaOH, KOH)');
    const step = first.search(/Add [\d.]+ mL of 1\.00 M NaOH/);
    assert.ok(caution >= 0, 'the caution is on page 1');
    assert.ok(step < 0 || caution < step, 'the caution comes before the NaOH step');
    assert.equal(text.split('Hydroxide (NaOH, KOH)').length - 1, 1, 'printed once');

    // A user's form name keeps its digits; formulas get subscripts.
    const d = doc();
    d.custom_forms = [{ system: 'phosphate', form: { id: 'lot_a0', name: 'lot A0', formula: 'NaH2PO4·H2O', units: 1, counter_ions: [['na', 1]] } }];
    d.recipe.method = { kind: 'two_forms', acid_form: 'lot_a0', base_form: 'na2hpo4_7h2o' };
    const p2 = await openApp(s, link(d));
    await p2.waitForSelector(tid('recipe-steps'));
    const steps = await p2.textContent(tid('recipe-steps'));
    assert.match(steps, /lot A0/);
    assert.doesNotMatch(steps, /lot A₀/);
    assert.match(steps, /NaH₂PO₄·H₂O/);

    // The field plot: the colder curve in blue, the warmer in brown (not one grey).
    await p2.click(tid('tab-field'));
    await p2.waitForSelector(`${tid('field-plot')}`);
    await p2.waitForTimeout(300);
    const colours = await p2.$eval(`canvas${tid('field-plot')}, ${tid('field-plot')} canvas`, (c) => {
      const ctx = c.getContext('2d');
      const { data } = ctx.getImageData(0, 0, c.width, c.height);
      let cold = 0;
      let warm = 0;
      for (let i = 0; i < data.length; i += 4) {
        const [r, g, b] = [data[i], data[i + 1], data[i + 2]];
        if (Math.abs(r - 0x2f) < 24 && Math.abs(g - 0x5f) < 24 && Math.abs(b - 0xb3) < 24) cold++;
        if (Math.abs(r - 0xa8) < 24 && Math.abs(g - 0x4b) < 24 && b < 40) warm++;
      }
      return { cold, warm };
    });
    assert.ok(colours.cold > 50 && colours.warm > 50, JSON.stringify(colours));
    s.assertClean('sheet and plots');
  } finally {
    await s.close();
  }
  const phone = await openSession({ allowedOrigin: srv.origin, view: 'phone' });
  try {
    const page = await openApp(phone, srv.url('/'));
    const budget = page.locator(`${ws('recipe')} details.u-budget`).first();
    await budget.locator('summary').click();
    await page.waitForTimeout(200);
    const fit = await page.evaluate(() => {
      const d = document.querySelector('[data-testid="ws-recipe"] details.u-budget');
      const last = d.querySelector('thead th:last-child').getBoundingClientRect();
      return { page: document.documentElement.scrollWidth, right: last.right, box: d.getBoundingClientRect().right };
    });
    assert.ok(fit.page <= 390, `the page stays 390 px wide (${fit.page})`);
    assert.ok(fit.right <= Math.min(390, fit.box) + 0.5, `the last column is not clipped (${fit.right})`);
    phone.assertClean('phone budget');
  } finally {
    await phone.close();
  }
});
