// In-browser solver timings: calls the exported bench_engine() of the release bundle and records
// µs per call in tests/artifacts/bench-browser.json, beside the native criterion figures.
// This measures; it does not assert a speed (timings belong in benchmarks, not pass/fail tests).
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { serveDist, openSession, waitForApp, ARTIFACTS } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

test('solver timings in Chromium (release bundle)', async (t) => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/'));
    await waitForApp(page);
    const json = await page.evaluate(() => window.wasmBindings.bench_engine());
    const figures = JSON.parse(json);
    for (const k of ['solve_us', 'curve_1000_us', 'titration_200_us', 'recipe_us']) {
      assert.ok(Number.isFinite(figures[k]) && figures[k] > 0, `${k} measured: ${json}`);
    }
    mkdirSync(ARTIFACTS, { recursive: true });
    writeFileSync(join(ARTIFACTS, 'bench-browser.json'), JSON.stringify(figures, null, 2));
    t.diagnostic(`browser timings (µs per call): ${json}`);
    console.log(`browser timings (µs per call): ${json}`);
    s.assertClean('bench');
  } finally {
    await s.close();
  }
});
