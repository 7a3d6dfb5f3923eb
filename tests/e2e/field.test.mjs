// Field reading journeys: the user's limit (over, crossing pH), alkalinity → free CO₂, salinity,
// and a day's log computed row by row the same as the command-line entry's `log`.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync, spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { serveDist, openSession, waitForApp, screenshot, ROOT, tid } from './harness.mjs';

const b64url = (s) => Buffer.from(s, 'utf8').toString('base64url');

function bw(args, input) {
  return execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    input,
    maxBuffer: 64 * 1024 * 1024,
  });
}
const demo = () => JSON.parse(bw(['--demo']));
/** The CLI's report for the demo design with `field` replaced. */
function fieldDoc(field) {
  const doc = demo();
  doc.field = field;
  const report = JSON.parse(bw(['-'], JSON.stringify(doc)));
  return { doc, field: report.field.Ok };
}

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

async function openField(s, doc) {
  const page = await s.newPage();
  await page.goto(srv.url(`/?ws=field#d=${b64url(JSON.stringify(doc))}`));
  await waitForApp(page);
  return page;
}

const AMMONIA = {
  system: 'ammonium',
  ph: 8.4,
  temperature_c: 24,
  total: 1.5,
  total_unit: 'mg_per_l_as',
  ionic: { kind: 'conductivity', us_cm: 600 },
  limit: { value: 0.02, unit: 'mg_per_l_nh3' },
};

test('ammonia with a limit: the page says over, and crosses at the CLI pH', async () => {
  const { doc, field } = fieldDoc(AMMONIA);
  assert.ok(field.limit.exceeded, 'the CLI says over');
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openField(s, doc);
    await page.waitForSelector(tid('field-limit'));
    assert.equal(await page.getAttribute(tid('field-limit'), 'data-state'), 'over');
    assert.match(await page.textContent(tid('field-limit-verdict')), /^Over/);
    const shown = Number(await page.getAttribute(tid('field-limit-crossing'), 'data-crossing-ph'));
    assert.ok(Math.abs(shown - field.limit.crossing_ph) < 1e-9, `crossing ${shown} vs ${field.limit.crossing_ph}`);
    assert.ok((await page.textContent(tid('field-limit-crossing'))).includes(field.limit.crossing_ph.toFixed(2)));
    assert.match(await page.textContent(tid('field-limit-note')), /local codes/);
    await page.waitForSelector(`${tid('field-plot')}[data-draw-count]`);
    await screenshot(page, 'field-limit-tablet');
    s.assertClean('ammonia limit');
  } finally {
    await s.close();
  }
});

test('carbonate from an alkalinity: free CO2 equals the CLI', async () => {
  const { doc, field } = fieldDoc({
    system: 'carbonate',
    ph: 7.6,
    temperature_c: 18,
    total: null,
    total_unit: 'mg_per_l_as',
    ionic: { kind: 'tds', mg_l: 250 },
    alkalinity: { value: 120, unit: 'mg_per_l_caco3' },
  });
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openField(s, doc);
    await page.waitForSelector(tid('field-free-co2'));
    const v = Number(await page.getAttribute(tid('field-free-co2'), 'data-value'));
    assert.ok(Math.abs(v - field.carbonate.free_co2_mg_l) <= 1e-12 * field.carbonate.free_co2_mg_l + 1e-15);
    const txt = await page.textContent(tid('field-free-co2'));
    assert.ok(txt.includes('mg/L'), txt);
    await page.waitForSelector(tid('field-dic'));
    s.assertClean('carbonate');
  } finally {
    await s.close();
  }
});

test('salinity as the ionic-strength source: I and the warning shown', async () => {
  const { doc, field } = fieldDoc({ ...AMMONIA, ionic: { kind: 'salinity', psu: 35 }, limit: undefined });
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openField(s, doc);
    await page.waitForSelector('#field-ionic-salinity-value');
    assert.equal(Number(await page.inputValue('#field-ionic-salinity-value')), 35);
    const frac = Number((await page.textContent(tid('field-fraction-1'))).replace('%', '').replace(',', '.').trim());
    const expected = field.species[1].fraction * 100;
    assert.ok(Math.abs(frac - expected) < 0.01 * expected + 0.005, `${frac} vs ${expected}`);
    assert.ok(field.warnings.length > 0, 'the CLI warns at 35 PSU');
    assert.ok((await page.textContent(tid('field-warnings'))).includes(field.warnings[0].slice(0, 30)));
    // At 35 PSU and 24 °C ammonia uses the seawater model (Clegg & Whitfield 1995), and the page
    // says so, as the CLI's result does.
    assert.equal(field.model, 'clegg_whitfield1995');
    assert.match(await page.textContent(tid('field-model')), /Clegg & Whitfield \(1995\), total pH scale/);
    // Past the model's salinity range Davies does not hold either (I ≈ 0.9): the CLI and the page
    // refuse the reading beside the salinity, naming both ranges, rather than show NH₃ 20–30 % low.
    const doc2 = demo();
    doc2.field = { ...AMMONIA, ionic: { kind: 'salinity', psu: 45 }, limit: undefined };
    const cli2 = JSON.parse(bw(['-'], JSON.stringify(doc2)));
    assert.ok(cli2.field.Err, 'the CLI refuses it too');
    const page2 = await openField(s, doc2);
    await page2.waitForSelector(tid('error-field-ionic-salinity-value'));
    const beside = await page2.textContent(tid('error-field-ionic-salinity-value'));
    assert.match(beside, /outside the seawater ammonia model/);
    assert.match(beside, /No value is given/);
    assert.match(await page2.textContent(tid('field-error')), /No value is given/);
    assert.equal(await page2.$(tid('field-fraction-1')), null, 'no fraction shown');
    s.assertClean('salinity');
  } finally {
    await s.close();
  }
});

const LOG = [
  'time;pH;temp °C;TAN mg/L',
  '06:00;7,8;21,5;1,2',
  '07:00;8,1;22;1,4',
  '08:00;n/a;22;1,4',
  '09:00;8,6;23,5;1,1',
  '10:00;9,0;25;0,9',
].join('\n') + '\n';

test('a pasted log with semicolons and decimal commas equals the CLI log row by row', async () => {
  const dir = mkdtempSync(join(tmpdir(), 'bw-log-'));
  const file = join(dir, 'log.csv');
  writeFileSync(file, LOG);
  // The CLI exits non-zero when a row has errors; its CSV is still on stdout.
  const cliCsv = spawnSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', 'log', '--system', 'ammonium', '--temp', '24', '--total', '1.5', '--conductivity', '600',
    '--limit', '0.02', '--limit-unit', 'mg_per_l_nh3', file], { cwd: ROOT, encoding: 'utf8' }).stdout;
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openField(s, fieldDoc(AMMONIA).doc);
    await page.fill(tid('field-log-text'), LOG);
    await page.click(tid('field-log-read'));
    await page.waitForSelector(`${tid('field-log-progress')}[data-running="false"][data-done="5"]`);
    assert.match(await page.textContent(tid('field-log-errors')), /Line 4/);
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('field-log-export'))]);
    const pageCsv = readFileSync(await dl.path(), 'utf8');
    const a = pageCsv.trim().split('\n');
    const b = cliCsv.trim().split('\n');
    assert.equal(a.length, 6);
    assert.equal(a.length, b.length);
    for (let i = 0; i < a.length; i++) assert.equal(a[i], b[i], `row ${i}`);
    await page.waitForSelector(`${tid('field-log-plot')}[data-draw-count]`);
    await screenshot(page, 'field-log-tablet');
    s.assertClean('log');
  } finally {
    await s.close();
  }
});

test('a hostile CSV (no pH column) shows the message and keeps what was computed', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openField(s, fieldDoc(AMMONIA).doc);
    await page.fill(tid('field-log-text'), LOG);
    await page.click(tid('field-log-read'));
    await page.waitForSelector(`${tid('field-log-progress')}[data-running="false"][data-done="5"]`);
    await page.fill(tid('field-log-text'), 'time,colour\n1,red\n');
    await page.click(tid('field-log-read'));
    await page.waitForSelector(tid('field-log-message'));
    assert.match(await page.textContent(tid('field-log-message')), /pH/i);
    assert.ok(await page.$(tid('field-log-table')), 'earlier results kept');
    s.assertClean('hostile');
  } finally {
    await s.close();
  }
});

for (const [name, opts] of [
  ['phone', { viewport: { width: 390, height: 844 }, deviceScaleFactor: 3, isMobile: true, hasTouch: true }],
  ['tablet', null],
]) {
  test(`field tab screenshot (${name})`, async () => {
    const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet', contextOptions: opts ?? {} });
    try {
      const page = await openField(s, fieldDoc(AMMONIA).doc);
      await page.waitForSelector(`${tid('field-plot')}[data-draw-count]`);
      await screenshot(page, `field-page-${name}`);
      s.assertClean(name);
    } finally {
      await s.close();
    }
  });
}
