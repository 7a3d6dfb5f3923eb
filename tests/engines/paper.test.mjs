//! Cross-engine: the print sheet carries the meter reading and a QR code that decodes to the
//! design's share link (read from the page's own SVG, and from a printed PDF where the engine's
//! driver can print); a day's field log opened as a file is computed row by row as the command
//! line computes it.
import { before } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { journey, tid, textOf, field, retype, waitFor, assertClean, screenshot } from './kit.mjs';
import { ARTIFACTS } from '../e2e/harness.mjs';
import { demoDoc, logCsv, num } from './cli.mjs';

const jsQR = createRequire(import.meta.url)('jsqr');

/**
 * The QR code's SVG path rasterised in the page (Path2D on a canvas, 8 px a module, a 4-module
 * quiet zone) and decoded here with jsQR.
 */
async function readQr(page) {
  const img = await page.evaluate((sel) => {
    const svg = document.querySelector(sel);
    if (!svg) return null;
    const n = Number(svg.getAttribute('viewBox').split(/\s+/)[2]);
    const d = svg.querySelector('path').getAttribute('d');
    const k = 8;
    const size = (n + 8) * k;
    const c = document.createElement('canvas');
    c.width = size;
    c.height = size;
    const ctx = c.getContext('2d');
    ctx.fillStyle = '#fff';
    ctx.fillRect(0, 0, size, size);
    ctx.setTransform(k, 0, 0, k, 4 * k, 4 * k);
    ctx.fillStyle = '#000';
    ctx.fill(new Path2D(d));
    const px = ctx.getImageData(0, 0, size, size).data;
    let bits = '';
    for (let i = 0; i < px.length; i += 4) bits += px[i] < 128 ? '1' : '0';
    return { size, bits };
  }, tid('sheet-qr-svg'));
  assert.ok(img, 'the sheet has its QR code');
  const rgba = new Uint8ClampedArray(img.size * img.size * 4);
  for (let i = 0; i < img.bits.length; i++) {
    const v = img.bits[i] === '1' ? 0 : 255;
    rgba.set([v, v, v, 255], i * 4);
  }
  return jsQR(rgba, img.size, img.size)?.data ?? null;
}

journey('the print sheet carries the meter reading and a QR code of the share link', async ({ serve, open, engine, t }) => {
  const srv = await serve();
  const page = await open(srv.url('/'));
  await retype(page, await field(page, 'Made and checked at'), '22', 'Tab');
  const meter = (await textOf(page, tid('recipe-meter-ph'))).trim();
  assert.match(meter, /^\d+\.\d\d$/, `meter reading ${meter}`);
  const link = await waitFor(page, (s) => document.querySelector(s)?.value || null, [tid('share-link')], { what: 'the share link' });
  // The sheet (print-only) follows the page: the same reading, the same link.
  await waitFor(page, (s, m) => document.querySelector(s)?.textContent.includes(m), [tid('sheet-meter-ph'), meter], { what: `the sheet's reading ${meter}` });
  await waitFor(page, (s, l) => document.querySelector(s)?.textContent.trim() === l, [tid('sheet-link'), link], { what: 'the sheet link' });
  await waitFor(page, (s) => !!document.querySelector(s), [tid('sheet-qr-svg')], { what: 'the QR code', timeout: 30_000 });
  assert.equal(await readQr(page), link, 'the QR code decodes to the share link');
  // The print stylesheet shows the sheet: checked with print media where the engine prints.
  const pdf = await page.pdf();
  if (pdf) {
    const dir = join(ARTIFACTS, 'engines');
    mkdirSync(dir, { recursive: true });
    const file = join(dir, `${engine}-sheet.pdf`);
    writeFileSync(file, pdf);
    const printed = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    assert.match(printed, /Meter must read/, 'printed: the meter heading');
    assert.ok(printed.includes(meter), `printed: the reading ${meter}`);
    assert.doesNotMatch(printed, /Print recipe sheet/, 'printed: no screen controls on paper');
    t.diagnostic(`printed to ${file}`);
  } else {
    t.diagnostic(`${engine}: the driver cannot print to PDF; the sheet was read from the page`);
  }
  await assertClean(page, 'sheet');
});

const LOG =
  ['time;pH;temp °C;TAN mg/L', '06:00;7,8;21,5;1,2', '07:00;8,1;22;1,4', '08:00;n/a;22;1,4', '09:00;8,6;23,5;1,1', '10:00;9,0;25;0,9'].join('\n') + '\n';
const AMMONIA = {
  system: 'ammonium',
  ph: 8.4,
  temperature_c: 24,
  total: 1.5,
  total_unit: 'mg_per_l_as',
  ionic: { kind: 'conductivity', us_cm: 600 },
  limit: { value: 0.02, unit: 'mg_per_l_nh3' },
};
let cliRows;
let doc;
before(() => {
  const dir = mkdtempSync(join(tmpdir(), 'bw-engines-log-'));
  const file = join(dir, 'log.csv');
  writeFileSync(file, LOG);
  const csv = logCsv(
    ['--system', 'ammonium', '--temp', '24', '--total', '1.5', '--conductivity', '600', '--limit', '0.02', '--limit-unit', 'mg_per_l_nh3'],
    file,
  );
  const [head, ...rows] = csv.trim().split('\n').map((l) => l.split(';'));
  cliRows = rows.map((r) => Object.fromEntries(head.map((h, i) => [h, r[i]])));
  doc = demoDoc();
  doc.field = AMMONIA;
});

journey('a field log opened as a file is computed row by row as the command line does', async ({ serve, open }) => {
  const srv = await serve();
  const page = await open(srv.url(`/?ws=field#d=${Buffer.from(JSON.stringify(doc), 'utf8').toString('base64url')}`), {
    width: 768,
    height: 1024,
  });
  await waitFor(page, (s) => !!document.querySelector(s), [tid('field-log-file')], { what: 'the log panel' });
  // The file goes through the file input as a picked file does (its change event, FileReader).
  await page.evaluate(
    (sel, csv) => {
      const input = document.querySelector(sel);
      const dt = new DataTransfer();
      dt.items.add(new File([csv], 'day-log.csv', { type: 'text/csv' }));
      input.files = dt.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
    },
    tid('field-log-file'),
    LOG,
  );
  await waitFor(page, (s) => !!document.querySelector(s), [`${tid('field-log-progress')}[data-running="false"][data-done="5"]`], { what: 'five rows computed' });
  assert.match(await textOf(page, tid('field-log-errors')), /Line 4/);
  const rows = await page.evaluate((s) =>
    [...document.querySelectorAll(`${s} tbody tr`)].map((tr) => [...tr.children].map((c) => c.textContent.trim())),
    tid('field-log-table'),
  );
  const computed = cliRows.filter((r) => !r.error);
  assert.ok(rows.length >= computed.length, `rows shown: ${rows.length}`);
  for (const r of computed) {
    const shown = rows.find((x) => x[1] === r.time);
    assert.ok(shown, `row ${r.time} shown`);
    const share = num(shown[4]);
    const want = num(r.fraction_NH3) * 100;
    assert.ok(Math.abs(share - want) <= 0.006 * want + 0.005, `${r.time}: share ${shown[4]} vs CLI ${want} %`);
    const amt = num(shown[5].split(' ')[0]);
    const wantAmt = num(r.NH3_mg_l_as_NH3);
    assert.ok(Math.abs(amt - wantAmt) <= 0.006 * wantAmt, `${r.time}: amount ${shown[5]} vs CLI ${wantAmt}`);
    assert.equal(shown[6] === 'over', r.limit_exceeded === 'yes', `${r.time}: over the limit`);
  }
  await waitFor(page, (s) => !!document.querySelector(s), [`${tid('field-log-plot')}[data-draw-count]`], { what: 'the log plot' });
  await screenshot(page, 'field-log');
  await assertClean(page, 'field log');
});
