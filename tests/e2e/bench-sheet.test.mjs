// The bench workflow end to end: a recipe made at the bench temperature as a 10× concentrate with
// two salts shows the same meter reading, concentrate pH and ionic strength, and masses as the
// command line for the same design document (the page's own export); the printed sheet (A4 and
// US Letter PDFs) carries the meter reading and a QR code that decodes back to the design's share
// link; a schema-1 share link and a schema-1 exported file still open.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import zlib from 'node:zlib';
import { serveDist, openSession, waitForApp, screenshot, ROOT, ARTIFACTS, tid } from './harness.mjs';

// jsQR (pure JS, tests/package.json): decodes the QR code from the printed page's pixels.
const JSQR = createRequire(import.meta.url).resolve('jsqr');

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});


async function openPage(s, url) {
  const page = await s.newPage();
  await page.goto(url);
  await waitForApp(page);
  return page;
}

/** Type into a field as a user does: select all, type the keys, leave the field. */
async function type(page, sel, text) {
  await page.click(sel, { clickCount: 3 });
  await page.keyboard.press('Control+A');
  await page.keyboard.type(text);
  await page.keyboard.press('Tab');
}

/** The CLI's JSON report for a design document. */
function cli(file) {
  const out = execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', file], {
    cwd: ROOT,
    encoding: 'utf8',
  });
  const report = JSON.parse(out);
  const recipe = report.recipe.Ok ?? report.recipe;
  assert.ok(recipe && recipe.meter, `the CLI solved the recipe: ${JSON.stringify(report.recipe).slice(0, 200)}`);
  return recipe;
}

/** A number as the page shows it ("7.52", "−0.12", "1.234"). */
const num = (t) => Number(String(t).replace('−', '-').replace(/[^0-9.eE+-]/g, ''));

/** A shown amount ("801.2 mg", "4.006 g") in grams. */
function grams(text) {
  const m = text.trim().match(/^([0-9.]+)\s*(mg|g)$/);
  assert.ok(m, `an amount in g or mg: ${text}`);
  return Number(m[1]) * (m[2] === 'mg' ? 1e-3 : 1);
}

/** Half a unit of the last digit shown, with room for binary rounding. */
function halfUlp(text) {
  const digits = text.replace(/\s*(mg|g|mM|M)$/, '').split('.')[1]?.length ?? 0;
  return 0.5 * 10 ** -digits + 1e-9;
}

test('meter reading, concentrate and two salts on the page equal the CLI for the same document', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s, srv.url('/'));
    await type(page, '#recipe-prep-temp', '22');
    await type(page, '#recipe-concentrate', '10');
    await page.click('details.more > summary');
    await page.click(tid('recipe-add-salt'));
    await page.click(tid('recipe-add-salt'));
    await page.waitForSelector('#recipe-salt-1-conc');
    assert.equal(await page.isDisabled(tid('recipe-add-salt')), true, 'both salts the engine knows are listed');
    // The KCl row, typed as users type: an ambiguous "1,000" is refused beside the field and
    // shows no amounts; then 3 mM, and a unit change after typing converts (0.003 M), never rescales.
    await type(page, '#recipe-salt-1-conc', '1,000');
    assert.ok((await page.textContent(tid('error-recipe-salt-1-conc'))).length > 0, '"1,000" is refused beside the field');
    assert.ok(await page.$(tid('recipe-stale')), 'no amounts while the field is marked');
    await type(page, '#recipe-salt-1-conc', '3');
    assert.equal(await page.$(tid('error-recipe-salt-1-conc')), null);
    const unit = page.locator('[data-testid="recipe-salt-1"] select.unit');
    await unit.selectOption({ label: 'M' });
    assert.equal(await page.inputValue('#recipe-salt-1-conc'), '0.003', 'the unit picker converts the amount on screen');
    // A duplicate is refused beside its own row (not merged), and nothing else changes.
    await page.selectOption('#recipe-salt-1-kind', 'nacl');
    const dup = await page.textContent(tid('error-recipe-salt-1-kind'));
    assert.match(dup, /listed twice/);
    assert.ok(await page.$(tid('recipe-error')), 'no recipe while the list holds a duplicate');
    assert.match(await page.textContent(tid('recipe-salts-rule')), /refused, not merged/);
    await page.selectOption('#recipe-salt-1-kind', 'kcl');
    await page.waitForSelector(tid('recipe-meter-ph'));
    assert.equal(await page.$(tid('error-recipe-salt-1-kind')), null);

    const shown = await page.evaluate(() => {
      const t = (id) => document.querySelector(`[data-testid="${id}"]`)?.textContent ?? '';
      const rows = [...document.querySelectorAll('tr[data-testid^="recipe-ingredient-"]')]
        .filter((r) => /^recipe-ingredient-\d+$/.test(r.dataset.testid))
        .map((r) => ({
          formula: r.querySelector('.formula').textContent,
          amount: r.querySelector('.amount').textContent,
        }));
      return { meter: t('recipe-meter-ph'), label: t('recipe-meter-label'), headline: t('recipe-headline'), conc: t('recipe-concentrate'), rows, steps: t('recipe-steps') };
    });
    await screenshot(page, 'bench-two-salts-desktop');

    // The same document the page would save: its own export.
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    const doc = readFileSync(await dl.path(), 'utf8');
    const parsed = JSON.parse(doc);
    assert.equal(parsed.schema, 2);
    assert.deepEqual(
      parsed.recipe.salts.map((x) => [x.additive, x.conc_m]),
      [['nacl', 0.137], ['kcl', 0.003]],
      'what was typed is what is saved',
    );
    assert.equal(parsed.recipe.prepare_temperature_c, 22);
    assert.equal(parsed.recipe.concentrate_factor, 10);
    mkdirSync(ARTIFACTS, { recursive: true });
    const file = join(ARTIFACTS, 'bench-two-salts.bwdesign.json');
    writeFileSync(file, doc);
    const r = cli(file);

    assert.equal(r.meter.temperature_c, 22);
    assert.ok(Math.abs(num(shown.meter) - r.meter.ph) <= halfUlp(shown.meter), `meter ${shown.meter} vs CLI ${r.meter.ph}`);
    // A 10× saline buffer (I > 1 M) is past the Davies range: no pH is predicted for the
    // concentrate (a wrong one would send the technician the wrong way), and the meter
    // figure is labelled as that of a portion diluted to working strength.
    const m = shown.conc.match(/pH not predicted.*·\s*I\s*([0-9.]+)\s*(mM|M)/);
    assert.ok(m, `concentrate line: ${shown.conc}`);
    assert.equal(r.concentrate.factor, 10);
    assert.equal(r.concentrate.ph, null, 'the CLI gives no pH for the concentrate either');
    assert.equal(r.meter.solution, 'diluted_portion');
    assert.match(shown.label, /a portion diluted 10-fold, not the concentrate/);
    assert.match(shown.headline, /^10× concentrate of 50 mM .* once diluted/, 'the headline says a concentrate is made');
    assert.match(shown.steps, /Check: dilute a portion 1 \+ 9 with water/);
    assert.doesNotMatch(shown.steps, /titrating until the meter reads/);
    const ionic = Number(m[1]) * (m[2] === 'mM' ? 1e-3 : 1);
    const ionicTol = halfUlp(m[1]) * (m[2] === 'mM' ? 1e-3 : 1);
    assert.ok(Math.abs(ionic - r.concentrate.ionic_strength) <= ionicTol, `I ${m[1]} ${m[2]} vs ${r.concentrate.ionic_strength}`);

    const sub = (f) => f.replace(/[₀-₉]/g, (c) => String(c.charCodeAt(0) - 0x2080)).replace(/·/g, '·');
    assert.deepEqual(
      shown.rows.map((x) => sub(x.formula)),
      r.ingredients.map((i) => i.formula),
      'the same reagents, in the same order',
    );
    for (const [i, ing] of r.ingredients.entries()) {
      const row = shown.rows[i];
      assert.ok(ing.grams != null, `${ing.formula} is weighed`);
      const tol = halfUlp(row.amount) * (row.amount.endsWith('mg') ? 1e-3 : 1);
      assert.ok(Math.abs(grams(row.amount) - ing.grams) <= tol, `${ing.formula}: page ${row.amount} vs CLI ${ing.grams} g`);
    }
    const salts = r.ingredients.filter((i) => i.formula === 'NaCl' || i.formula === 'KCl');
    assert.equal(salts.length, 2, 'every salt is weighed');
    // 10× concentrate of 0.137 M NaCl in 0.5 L: 0.685 mol (58.44 g/mol, CIAAW weights, from memory).
    assert.ok(Math.abs(salts[0].grams - 0.685 * 58.44) < 0.05, `NaCl ${salts[0].grams}`);
    assert.match(shown.steps, /NaCl/);
    assert.match(shown.steps, /KCl/);
    s.assertClean('two salts');
  } finally {
    await s.close();
  }
});

/** Decode the QR code in a PNG with jsQR, in a blank page of the session (no network). */
async function decodeQr(s, png) {
  const page = await s.newPage();
  await page.addScriptTag({ path: JSQR });
  const result = await page.evaluate(async (b64) => {
    const img = new Image();
    img.src = `data:image/png;base64,${b64}`;
    await img.decode();
    const c = document.createElement('canvas');
    c.width = img.naturalWidth;
    c.height = img.naturalHeight;
    const ctx = c.getContext('2d');
    ctx.drawImage(img, 0, 0);
    const data = ctx.getImageData(0, 0, c.width, c.height);
    const code = window.jsQR(data.data, c.width, c.height);
    return code ? code.data : null;
  }, png.toString('base64'));
  await page.close();
  return result;
}

test('the printed sheet carries the meter reading and a QR code of the share link, on A4 and Letter', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s, srv.url('/'));
    await type(page, '#recipe-prep-temp', '22');
    await page.click('details.more > summary');
    await page.click(tid('recipe-add-salt'));
    await page.click(tid('recipe-add-salt'));
    await page.waitForSelector(tid('recipe-meter-ph'));
    const meter = (await page.textContent(tid('recipe-meter-ph'))).trim();
    const link = await page.inputValue(tid('share-link'));
    assert.match(link, /#z=[A-Za-z0-9_-]+\.[0-9a-f]{8}$/);
    assert.equal((await page.textContent(tid('sheet-link'))).trim(), link, 'the sheet carries the current share link');
    // The code is made a moment after the last change (and at once before printing).
    await page.waitForSelector(tid('sheet-qr-svg'), { state: 'attached' });

    const dir = join(ARTIFACTS, 'bench-sheet');
    mkdirSync(dir, { recursive: true });
    for (const format of ['A4', 'Letter']) {
      const pdf = join(dir, `sheet-${format}.pdf`);
      await page.pdf({ path: pdf, format });
      const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
      assert.match(text, /Meter must read/, `${format}: meter heading`);
      assert.ok(text.includes(meter), `${format}: meter reading ${meter} printed`);
      assert.match(text, /Prepared by/);
      assert.match(text, /NaCl lot/);
      assert.match(text, /KCl lot/);
      assert.match(text, /Expiry/);
      assert.match(text, /Meter reading observed/);
      assert.doesNotMatch(text, /Add a salt|Print recipe sheet/, `${format}: no screen controls on paper`);
      const prefix = join(dir, `sheet-${format}`);
      execFileSync('pdftoppm', ['-png', '-r', '150', pdf, prefix]);
      const pages = readdirSync(dir).filter((f) => f.startsWith(`sheet-${format}-`) && f.endsWith('.png')).sort();
      assert.ok(pages.length >= 1, `${format}: pages rendered`);
      let decoded = null;
      for (const p of pages) {
        decoded = await decodeQr(s, readFileSync(join(dir, p)));
        if (decoded) break;
      }
      assert.equal(decoded, link, `${format}: the printed QR code decodes to the share link`);
    }
    assert.match(
      execFileSync('pdftotext', [join(dir, 'sheet-A4.pdf'), '-'], { encoding: 'utf8' }),
      /Cautions: none specific to these reagents/,
      'phosphate salts: no specific caution, the general reminder is printed',
    );
    // Titrated with a hydroxide stock: its caution goes on the sheet.
    await page.click('label[for="recipe-method-titrate"]');
    await page.waitForSelector(tid('recipe-cautions'));
    await page.waitForSelector(tid('sheet-qr-svg'), { state: 'attached' });
    const titrated = join(dir, 'sheet-titrated-A4.pdf');
    await page.pdf({ path: titrated, format: 'A4' });
    const ttext = execFileSync('pdftotext', [titrated, '-'], { encoding: 'utf8' });
    assert.match(ttext, /Hydroxide \(NaOH, KOH\)/, 'the hydroxide caution is printed');
    assert.match(ttext, /safety data/, 'with the deferral to safety data sheets');
    execFileSync('pdftoppm', ['-png', '-r', '80', titrated, join(dir, 'sheet-titrated-A4')]);
    s.assertClean('sheet');
  } finally {
    await s.close();
  }
});

/** A `#z=` link as a schema-1 page made it: raw deflate, base64url, CRC-32 of the payload. */
function checkedLink(json) {
  const payload = zlib.deflateRawSync(Buffer.from(json, 'utf8'), { level: 9 }).toString('base64url');
  const check = (zlib.crc32(payload) >>> 0).toString(16).padStart(8, '0');
  return `#z=${payload}.${check}`;
}

const SCHEMA1 = join(ROOT, 'solver', 'tests', 'data', 'schema1', 'demo-with-salt.json');

async function assertSalineRecipe(page) {
  await page.waitForSelector(tid('recipe-ingredient-0'));
  await page.click('details.more > summary');
  assert.equal(await page.inputValue('#recipe-salt-0-kind'), 'nacl', 'the one salt became the first row');
  assert.equal(await page.$('#recipe-salt-1-kind'), null, 'and the only one');
  const text = await page.textContent(tid('recipe-steps'));
  assert.match(text, /NaCl/);
}

test('a schema-1 share link and a schema-1 exported file still open', async () => {
  const old = readFileSync(SCHEMA1, 'utf8');
  assert.equal(JSON.parse(old).schema, 1);
  assert.ok(JSON.parse(old).recipe.salt, 'a schema-1 recipe with its one salt');
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const viaLink = await openPage(s, srv.url('/') + checkedLink(JSON.stringify(JSON.parse(old))));
    assert.match(await viaLink.textContent(tid('design-name')), /with saline/);
    await assertSalineRecipe(viaLink);
    assert.equal(await viaLink.inputValue('#recipe-salt-0-conc'), '150');

    const page = await openPage(s, srv.url('/'));
    await page.setInputFiles(tid('import-file'), {
      name: 'assay-buffer.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(old),
    });
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 1);
    await page.click(`tr[data-testid="design-row-0"] ${tid('open-design')}`);
    await page.waitForFunction(() => /with saline/.test(document.querySelector('[data-testid="design-name"]')?.textContent || ''));
    await assertSalineRecipe(page);
    await screenshot(page, 'bench-schema1-import-tablet');
    s.assertClean('schema 1');
  } finally {
    await s.close();
  }
});

test('a concentrate kept in the cold room is warned beside the salt that will crystallise, as the CLI says', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(s, srv.url('/'));
    await type(page, '#recipe-prep-temp', '22');
    await type(page, '#recipe-concentrate', '10');
    await page.waitForSelector(tid('recipe-meter-ph'));
    const none = await page.$$('[data-testid$="-solubility"]');
    assert.equal(none.length, 0, 'made and kept at 22 °C: nothing to say');
    // Typed as people type: "4,0" is 4 °C.
    await type(page, '#recipe-store-temp', '4,0');
    await page.waitForSelector('[data-testid$="-solubility"]');
    const rows = await page.$$eval('tr[data-testid^="recipe-ingredient-"]', (trs) =>
      trs.map((tr) => ({ formula: tr.querySelector('.formula')?.textContent, note: tr.querySelector('[data-testid$="-solubility"]')?.textContent ?? '' })));
    const flagged = rows.filter((r) => r.note);
    assert.equal(flagged.length, 1, JSON.stringify(rows));
    assert.match(flagged[0].formula, /Na₂HPO₄/);
    assert.match(flagged[0].note, /at 4 °C, where it is kept/);
    // The same design through the CLI gives the same warning.
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    const doc = JSON.parse(readFileSync(await dl.path(), 'utf8'));
    assert.equal(doc.recipe.store_temperature_c, 4);
    mkdirSync(ARTIFACTS, { recursive: true });
    const file = join(ARTIFACTS, 'cold-room.bwdesign.json');
    writeFileSync(file, JSON.stringify(doc));
    const r = cli(file);
    const w = r.warnings.filter((x) => x.kind === 'solubility');
    assert.equal(w.length, 1);
    assert.equal(w[0].stored, true);
    assert.equal(w[0].formula, 'Na2HPO4·7H2O');
    await screenshot(page, 'cold-room-concentrate-tablet');
    s.assertClean('cold room');
  } finally {
    await s.close();
  }
});
