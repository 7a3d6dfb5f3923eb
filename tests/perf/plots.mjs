// Input-to-redraw timing of the species workspace plots (figures in app/PERF.md).
// Usage, after a release build: node tests/perf/plots.mjs [dist-dir] [--throttled-only] [--runs=N]
//   dist-dir default dist/; --throttled-only: only the 768×1024 DPR 2, CPU ×4 case;
//   --runs=N: repeat the cases N times in one browser (median of each run printed).
import { startServer } from '../e2e/server.mjs';
import { launchChromium } from '../e2e/browser.mjs';
const args = process.argv.slice(2);
const dir = args.find(a => !a.startsWith('--'));
const throttledOnly = args.includes('--throttled-only');
const runs = Number((args.find(a => a.startsWith('--runs=')) || '--runs=1').slice(7));
const srv = await startServer({ root: dir || new URL('../../dist', import.meta.url).pathname, port: 0 });
const browser = await launchChromium();
const results = {};
const cases = throttledOnly ? [[768, 1024, 2, 4]] : [[768, 1024, 2, 1], [1366, 768, 1, 1], [768, 1024, 2, 4]];
for (let run = 0; run < runs; run++) for (const [w, h, dpr, throttle] of cases) {
  const ctx = await browser.newContext({ viewport: { width: w, height: h }, deviceScaleFactor: dpr, serviceWorkers: 'block' });
  const page = await ctx.newPage();
  await page.goto(srv.url('/'));
  await page.click('[data-testid="tab-species"]');
  await page.waitForSelector('canvas[data-testid="plot-titration"][data-draw-count]');
  await page.waitForTimeout(300);
  if (throttle > 1) {
    const cdp = await ctx.newCDPSession(page);
    await cdp.send('Emulation.setCPUThrottlingRate', { rate: throttle });
  }
  const r = await page.evaluate(async () => {
    const q = id => document.querySelector(`canvas[data-testid="${id}"]`);
    const count = c => Number(c.dataset.drawCount || 0);
    const frame = () => new Promise(r => requestAnimationFrame(() => setTimeout(r, 10)));
    async function waitDrawn(cs, before) {
      for (let i = 0; i < 2000 && !cs.every((c, j) => count(c) > before[j]); i++) await new Promise(r => setTimeout(r, 0));
      return Math.max(...cs.map(c => Number(c.dataset.drawnAt)));
    }
    // Main-thread time of the browser's next frame (style, layout, paint, commit): from
    // the animation-frame callback to a task queued in it, which runs after the frame.
    const frameWork = () => new Promise(r => requestAnimationFrame(() => {
      const t = performance.now();
      setTimeout(() => r(performance.now() - t), 0);
    }));
    const plotsDiv = document.querySelector('.plots');
    const med = a => { const s = [...a].sort((x, y) => x - y); return +s[Math.floor(s.length / 2)].toFixed(2); };
    const p90 = a => { const s = [...a].sort((x, y) => x - y); return +s[Math.floor(s.length * 0.9)].toFixed(2); };
    const all = ['plot-species', 'plot-capacity', 'plot-titration'].map(q);
    const N = 41;
    // 1. plot source toggle: recomputes every curve from the design and redraws all three plots
    const src = [], srcFrame = [], solve = [], paints = [], pre = [];
    for (let k = 0; k < N; k++) {
      const before = all.map(count);
      const t0 = performance.now();
      document.querySelector(k % 2 ? '[data-testid="plot-source-recipe"]' : '[data-testid="plot-source-mixture"]').click();
      const t = await waitDrawn(all, before) - t0;
      src.push(t);
      // Input → the first canvas starting to paint: event, reactive update, solver, other effects.
      pre.push(Math.min(...all.map(c => Number(c.dataset.drawnAt) - Number(c.dataset.drawMs))) - t0);
      srcFrame.push(t + await frameWork());
      if (plotsDiv && plotsDiv.dataset.computeMs) solve.push(Number(plotsDiv.dataset.computeMs));
      paints.push(all.reduce((a, c) => a + Number(c.dataset.drawMs), 0));
      await frame();
    }
    // 2. pointer move on the species plot: cursor + readout, redraws species and capacity plots
    const sp = all[0];
    const rect = sp.getBoundingClientRect();
    const mv = [];
    for (let k = 0; k < N; k++) {
      const cs = [all[0], all[1]];
      const before = cs.map(count);
      const t0 = performance.now();
      sp.dispatchEvent(new PointerEvent('pointermove', { bubbles: true, clientX: rect.left + rect.width * (0.2 + 0.6 * k / N), clientY: rect.top + rect.height / 2 }));
      mv.push(await waitDrawn(cs, before) - t0);
      await frame();
    }
    // 3. fraction/concentration toggle: redraws the species plot only
    const qt = [];
    for (let k = 0; k < N; k++) {
      const before = [count(sp)];
      const t0 = performance.now();
      document.querySelector(k % 2 ? '[data-testid="plot-quantity-fraction"]' : '[data-testid="plot-quantity-concentration"]').click();
      qt.push(await waitDrawn([sp], before) - t0);
      await frame();
    }
    return {
      sourceToggle_allThree: { median: med(src), p90: p90(src) },
      sourceToggle_withNextFrameWork: { median: med(srcFrame), p90: p90(srcFrame) },
      sourceToggle_threePaints: { median: med(paints), p90: p90(paints) },
      sourceToggle_beforeFirstPaint: { median: med(pre), p90: p90(pre) },
      sourceToggle_solver: solve.length ? { median: med(solve), p90: p90(solve) } : 'not recorded by this build',
      pointerMove_speciesAndCapacity: { median: med(mv), p90: p90(mv) },
      quantityToggle_species: { median: med(qt), p90: p90(qt) },
      singleDrawMs: all.map(c => c.dataset.testid + ' ' + c.dataset.drawMs),
    };
  });
  results[`${runs > 1 ? `run ${run + 1}: ` : ''}${w}x${h} dpr ${dpr}${throttle > 1 ? ` cpu÷${throttle}` : ''}`] = r;
  await ctx.close();
}
console.log(JSON.stringify(results, null, 1));
console.log(await (async () => { const b = await launchChromium(); const v = b.version(); await b.close(); return 'chromium ' + v; })());
await browser.close(); await srv.close();
