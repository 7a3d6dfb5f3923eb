// Meter bench journeys: the standards at the bench temperature, a calibration typed in (by
// keyboard), its slope, offset and sample pH equal to `bufferwright calibrate`, rows that keep
// their own reading when another is removed, refusals beside the field, the printed bench sheet,
// and the phone layout. Readings are invented (a synthetic electrode), not a real meter's.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { serveDist, openSession, waitForApp, screenshot, axeAudit, ROOT, tid } from './harness.mjs';

function calibrate(args) {
  return JSON.parse(
    execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', 'calibrate', ...args, '--json'], {
      cwd: ROOT,
      encoding: 'utf8',
    }),
  );
}

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

async function openMeter(s) {
  const page = await s.newPage();
  await page.goto(srv.url('/?ws=meter'));
  await waitForApp(page);
  await page.waitForSelector(tid('meter-standards'));
  return page;
}

const rowIds = (page) =>
  page.$$eval('[data-testid^="meter-row-"]', (els) => els.map((e) => e.getAttribute('data-testid').slice('meter-row-'.length)));

/** Type into a field by keyboard: focus, select all, type. */
async function typeInto(page, selector, text) {
  await page.focus(selector);
  await page.keyboard.press('Control+A');
  await page.keyboard.type(text);
  await page.keyboard.press('Tab');
}

test('calibration typed by keyboard equals the CLI; rows are keyed by id; sheet and record', async () => {
  // Invented electrode at 10 °C: phosphate 1:1 (pH(S) 6.923) 4.2 mV, phthalate (4.0012) 168.9 mV,
  // borax (9.332) -130.4 mV; sample 55.0 mV.
  const cli = calibrate(['--temp', '10', '--point', 'phosphate_1_1=4.2', '--point', 'phthalate=168.9', '--point', 'borax=-130.4', '--sample-mv', '55']);
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/'));
    await waitForApp(page);
    // Keyboard: from the Field reading tab, ArrowRight reaches the meter bench.
    await page.focus(tid('tab-field'));
    await page.keyboard.press('Enter');
    await page.keyboard.press('ArrowRight');
    await page.waitForSelector(tid('meter-standards'));
    assert.equal(await page.getAttribute(tid('tab-meter'), 'aria-selected'), 'true');
    // The standards at 25 °C, then at 10 °C.
    assert.match(await page.textContent(tid('meter-std-phosphate_1_1')), /6\.865/);
    await typeInto(page, '#meter-temp', '10');
    await page.waitForFunction(() => document.querySelector('[data-testid="meter-std-phosphate_1_1"]').textContent.includes('6.923'));
    assert.match(await page.textContent(tid('meter-std-borax')), /9\.332/);
    assert.match(await page.textContent(tid('meter-std-tartrate')), /only 25–50 °C/);
    assert.match(await page.textContent(tid('meter-std-borax')), /\(/, 'the engine value and difference beside');

    const [a, b] = await rowIds(page);
    await typeInto(page, `#meter-pt-${a}-mv`, '4.2');
    await typeInto(page, `#meter-pt-${b}-mv`, '168.9');
    await page.click(tid('meter-add'));
    const ids = await rowIds(page);
    assert.equal(ids.length, 3);
    const c = ids[2];
    assert.equal(await page.inputValue(`#meter-pt-${c}-std`), 'borax', 'the next usual standard, 1 pH or more from the others');
    await typeInto(page, `#meter-pt-${c}-mv`, '-130.4');
    await typeInto(page, '#meter-sample-mv', '55');

    await page.waitForSelector(tid('meter-percent'));
    assert.equal(await page.textContent(tid('meter-percent')), `${cli.slope_percent.toFixed(1)} %`);
    assert.ok((await page.textContent(tid('meter-offset'))).includes(Math.abs(cli.mv_at_ph7).toFixed(1)));
    assert.equal(await page.textContent(tid('meter-sample-ph')), `pH ${cli.sample.ph.toFixed(2)}`);
    assert.ok((await page.textContent(tid('meter-sample-u'))).includes(cli.sample.u95_ph.toFixed(2)));
    for (const v of cli.verdicts) {
      const id = v.standard ?? v.check;
      assert.match(await page.textContent(tid(`meter-verdict-${id}`)), v.pass ? /^Pass/ : /^Fail/, id);
    }
    // A person reads the standards' names, never the document's ids (phosphate_1_1).
    const fitText = await page.textContent(tid('meter-verdict-phosphate_1_1'));
    assert.ok(!fitText.includes('phosphate_1_1') && fitText.includes('phosphate'), fitText);
    assert.ok(!(await page.textContent('section:has(.meter-verdicts)')).includes('phosphate_1_1'), 'no id in the fit table');
    await screenshot(page, 'meter-desktop');

    // The printed bench sheet (on the recipe tab) carries slope, offset and a lot line per standard.
    await page.click(tid('tab-recipe'));
    await page.emulateMedia({ media: 'print' });
    await page.waitForSelector(tid('sheet-meter'));
    const sheet = await page.textContent(tid('sheet-meter'));
    assert.ok(sheet.includes(`${cli.slope_percent.toFixed(1)} % of Nernst`), sheet);
    assert.ok(sheet.includes('Offset') && sheet.includes('lot'), sheet);
    assert.ok(sheet.includes('borax') && sheet.includes('9.332'), sheet);
    await page.emulateMedia({ media: 'screen' });

    // Back on the bench: removing the first row leaves the others with their own readings.
    await page.click(tid('tab-meter'));
    await page.waitForSelector(tid(`meter-remove-${a}`));
    await page.click(tid(`meter-remove-${a}`));
    await page.waitForFunction((id) => !document.querySelector(`[data-testid="meter-row-${id}"]`), a);
    assert.deepEqual(await rowIds(page), [b, c]);
    assert.equal(await page.inputValue(`#meter-pt-${b}-mv`), '168.9');
    assert.equal(await page.inputValue(`#meter-pt-${c}-mv`), '-130.4');
    const two = calibrate(['--temp', '10', '--point', 'phthalate=168.9', '--point', 'borax=-130.4', '--sample-mv', '55']);
    await page.waitForFunction(
      (want) => document.querySelector('[data-testid="meter-percent"]')?.textContent === want,
      `${two.slope_percent.toFixed(1)} %`,
    );
    s.assertClean('meter journey');
  } finally {
    await s.close();
  }
});

test('bad input is refused beside its field and changes nothing', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openMeter(s);
    const [a, b] = await rowIds(page);
    await typeInto(page, `#meter-pt-${a}-mv`, '7.8');
    await typeInto(page, `#meter-pt-${b}-mv`, '175.1');
    await page.waitForSelector(tid('meter-percent'));
    const good = await page.textContent(tid('meter-percent'));
    // Out of ±2000 mV: the field says so and the fit stands as it was (results marked stale).
    await typeInto(page, `#meter-pt-${b}-mv`, '2500');
    assert.match(await page.textContent(tid(`error-meter-pt-${b}-mv`)), /2000/);
    await page.waitForSelector(tid('meter-stale'));
    await typeInto(page, `#meter-pt-${b}-mv`, '175.1');
    await page.waitForSelector(tid('meter-percent'));
    assert.equal(await page.textContent(tid('meter-percent')), good);
    // A slope far from Nernst names the point.
    await typeInto(page, `#meter-pt-${b}-mv`, '40');
    await page.waitForSelector(tid('meter-error'));
    assert.match(await page.textContent(tid('meter-error')), /% of Nernst/);
    assert.match(await page.textContent(tid(`error-meter-pt-${b}-mv`)), /phthalate/);
    // Two standards closer than 1 pH: the slope is ill-defined, said under the standard.
    await typeInto(page, `#meter-pt-${b}-mv`, '175.1');
    await page.selectOption(`#meter-pt-${a}-std`, 'citrate');
    await page.waitForSelector(tid('meter-error'));
    assert.match(await page.textContent(`${tid(`meter-row-${b}`)} .field-msg`), /ill-defined/);
    s.assertClean('meter refusals');
  } finally {
    await s.close();
  }
});

test('on a phone the bench fits the screen', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'phone' });
  try {
    const page = await openMeter(s);
    const [a, b] = await rowIds(page);
    await typeInto(page, `#meter-pt-${a}-mv`, '7.8');
    await typeInto(page, `#meter-pt-${b}-mv`, '175.1');
    await page.waitForSelector(tid('meter-percent'));
    const [scroll, width] = await page.evaluate(() => [document.documentElement.scrollWidth, innerWidth]);
    assert.ok(scroll <= width + 1, `page ${scroll} px wide on a ${width} px screen`);
    await screenshot(page, 'meter-phone');
    s.assertClean('meter phone');
  } finally {
    await s.close();
  }
});

test('the bench has no serious or critical axe violations, with a fit and a refusal on screen', async (t) => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet', contextOptions: { bypassCSP: true } });
  try {
    const page = await openMeter(s);
    const [a, b] = await rowIds(page);
    await typeInto(page, `#meter-pt-${a}-mv`, '7.8');
    await typeInto(page, `#meter-pt-${b}-mv`, '175.1');
    await page.waitForSelector(tid('meter-percent'));
    await typeInto(page, '#meter-sample-mv', '5000');
    const violations = await axeAudit(page, { include: '#workspace' });
    for (const v of violations) t.diagnostic(`${v.impact} ${v.id}: ${v.help} at ${v.nodes.join(' | ')}`);
    assert.deepEqual(violations.map((v) => `${v.impact} ${v.id}`), []);
    s.assertClean('meter axe');
  } finally {
    await s.close();
  }
});
