// Trust journeys: the footer's "Check the engine" view runs the solver's self-check in the page
// (every case passes, the CSV downloads, the print shows the report alone), and the recipe and
// flask results carry their expanded uncertainty (± U, k = 2) from the solver.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFile } from 'node:fs/promises';
import { serveDist, openSession, waitForApp, screenshot, tid, openApp } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});


const openPage = (s) => openApp(s, srv.url('/'));

test('the engine check runs in the page: all cases pass, the CSV downloads, the report prints alone', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(s);
    assert.equal(await page.$(tid('selfcheck-summary')), null, 'the check runs only when opened');
    await page.click(tid('selfcheck-open'));
    await page.waitForSelector(tid('selfcheck-summary'));
    const summary = (await page.textContent(tid('selfcheck-summary'))).trim();
    const m = summary.match(/(\d+) passed, (\d+) failed/);
    assert.ok(m, `summary: ${summary}`);
    assert.ok(Number(m[1]) > 20, `a real list of cases: ${summary}`);
    assert.equal(Number(m[2]), 0, `no failure: ${summary}`);
    assert.match(summary, /Engine \d+\.\d+\.\d+/);
    assert.match(summary, /\d{4}-\d\d-\d\d/);
    const rows = await page.$$eval('[data-testid^="selfcheck-row-"]', (els) =>
      els.map((e) => ({ id: e.dataset.testid, pass: e.dataset.pass, text: e.textContent })),
    );
    assert.equal(rows.length, Number(m[1]));
    assert.deepEqual(rows.filter((r) => r.pass !== 'true'), [], 'no row fails');
    assert.ok(rows.every((r) => /pass/.test(r.text)));
    await screenshot(page, 'trust-selfcheck-tablet');

    // CSV: one line per row plus the header, every case passing.
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('selfcheck-csv'))]);
    assert.match(dl.suggestedFilename(), /^bufferwright-self-check-\d{4}-\d\d-\d\d\.csv$/);
    const csv = (await readFile(await dl.path(), 'utf8')).trim().split('\n');
    assert.match(csv[0], /^id,case,published,computed,difference,tolerance,pass,status,source,engine_version$/);
    assert.equal(csv.length, rows.length + 1);
    assert.ok(csv.slice(1).every((l) => l.includes(',pass,')), 'every CSV line passes');

    // Print: the page is marked while print() runs, and print media then shows only the report.
    await page.evaluate(() => {
      window.__printMark = null;
      window.print = () => {
        window.__printMark = document.documentElement.getAttribute('data-print');
      };
    });
    await page.click(tid('selfcheck-print'));
    assert.equal(await page.evaluate(() => window.__printMark), 'selfcheck');
    assert.equal(await page.evaluate(() => document.documentElement.getAttribute('data-print')), null, 'mark cleared');
    await page.evaluate(() => document.documentElement.setAttribute('data-print', 'selfcheck'));
    await page.emulateMedia({ media: 'print' });
    const shown = await page.evaluate(() => {
      const vis = (sel) => {
        const e = document.querySelector(sel);
        return !!e && e.getBoundingClientRect().height > 0 && getComputedStyle(e).display !== 'none';
      };
      return { table: vis('[data-testid="selfcheck-table"]'), workspace: vis('#workspace'), tabs: vis('.tabs') };
    });
    assert.deepEqual(shown, { table: true, workspace: false, tabs: false });
    await screenshot(page, 'trust-selfcheck-print-tablet');
    // Without the mark, printing is the recipe sheet as before: the report stays out.
    await page.evaluate(() => document.documentElement.removeAttribute('data-print'));
    const recipePrint = await page.evaluate(() => ({
      workspace: getComputedStyle(document.querySelector('#workspace')).display !== 'none',
      report: document.querySelector('[data-testid="selfcheck-table"]').getBoundingClientRect().height > 0,
    }));
    assert.deepEqual(recipePrint, { workspace: true, report: false });
    await page.emulateMedia({ media: 'screen' });
    s.assertClean('engine check');
  } finally {
    await s.close();
  }
});

test('the recipe and the flask show pH ± U (k = 2) from the solver, with a budget and the user\'s figures', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(s);
    await page.waitForSelector(tid('recipe-u95'));
    const line = (await page.textContent(tid('recipe-u95'))).trim();
    const m = line.match(/pH (\d+\.\d+) ± (\d+\.\d+)/);
    assert.ok(m, `U line: ${line}`);
    assert.match(line, /U, k = 2, about 95 %/);
    assert.equal(m[1].slice(0, 4), (await page.textContent(tid('recipe-ph-exact'))).trim().slice(0, 4));
    const u = Number(m[2]);
    assert.ok(u > 0 && u < 0.2, `plausible U: ${u}`);
    await page.click(`${tid('recipe-u95-budget')} > summary`);
    const budget = await page.$$eval(`${tid('recipe-u95-budget')} tbody tr`, (trs) => trs.map((t) => t.textContent));
    assert.ok(budget.some((r) => /pK/.test(r)), 'the pK data are in the budget');
    assert.ok(budget.some((r) => /mass of/.test(r)), 'the weighings are in the budget');
    await screenshot(page, 'trust-recipe-u95-tablet');

    // A coarse balance: U grows and the page warns about the small masses.
    await page.click(`${tid('recipe-uncertainty-inputs')} > summary`);
    await page.fill('#recipe-u-balance', '500');
    await page.waitForFunction(
      (before) => {
        const t = document.querySelector('[data-testid="recipe-u95"]')?.textContent || '';
        const m = t.match(/± (\d+\.\d+)/);
        return m && Number(m[1]) > before;
      },
      u,
      { timeout: 5000 },
    );
    assert.match(await page.textContent(tid('recipe-u95-warnings')), /balance readability/);
    await page.click(tid('recipe-u-flask-own'));
    await page.waitForSelector('#recipe-u-flask');
    await screenshot(page, 'trust-recipe-u-inputs-tablet');

    await page.click(tid('tab-mixture'));
    await page.waitForSelector(tid('mixture-u95'));
    assert.match(await page.textContent(tid('mixture-u95')), /pH \d+\.\d+ ± \d+\.\d+ \(U, k = 2, about 95 %\)/);
    await page.click(tid('tab-field'));
    await page.waitForSelector(tid('field-hero'));
    assert.match(await page.textContent(tid('field-u95')), /± [\d.]+ percentage points \(U, k = 2/);
    await screenshot(page, 'trust-field-u95-tablet');
    s.assertClean('uncertainty');
  } finally {
    await s.close();
  }
});
