// Cold start, two builds compared: first visits (new profile, service workers blocked) of two
// dist directories, alternating, with Chromium's CPU throttled ×4 at 768×1024 DPR 2; prints, per
// build, the median time to the answer in the page and to the first contentful paint (the frame
// that shows it). A measurement script, not a test (figures in app/PERF.md).
// Usage, after two release builds: node tests/perf/coldstart-ab.mjs DIST_A DIST_B [runs]   (default 12)
import { startServer } from '../e2e/server.mjs';
import { launchChromium } from '../e2e/browser.mjs';
const dirs = process.argv.slice(2, 4); const n = Number(process.argv[4] || 12);
const srvs = await Promise.all(dirs.map((root) => startServer({ root, port: 0 })));
const browser = await launchChromium();
const WATCH = () => {
  document.addEventListener('DOMContentLoaded', () => {
    const o = new MutationObserver(() => {
      if (window.__a === undefined && /pH\s*\d/.test(document.querySelector('[data-testid="answer"]')?.textContent || '')) {
        window.__a = performance.now(); o.disconnect();
        new PerformanceObserver((l) => { const f = l.getEntries().find((e) => e.name === 'first-contentful-paint'); if (f && window.__p === undefined) window.__p = f.startTime; }).observe({ type: 'paint', buffered: true });
      }
    });
    o.observe(document.body, { childList: true, subtree: true, characterData: true });
  });
};
const res = dirs.map(() => ({ a: [], p: [] }));
for (let i = 0; i < n; i++) for (let k = 0; k < dirs.length; k++) {
  const ctx = await browser.newContext({ viewport: { width: 768, height: 1024 }, deviceScaleFactor: 2, serviceWorkers: 'block' });
  await ctx.addInitScript(WATCH);
  const page = await ctx.newPage();
  const cdp = await ctx.newCDPSession(page);
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: 4 });
  await page.goto(srvs[k].url('/'));
  await page.waitForFunction(() => window.__p !== undefined, null, { timeout: 60000 });
  const [a, p] = await page.evaluate(() => [window.__a, window.__p]);
  res[k].a.push(a); res[k].p.push(p);
  await ctx.close();
}
const med = (xs) => { const s = [...xs].sort((a, b) => a - b); return Math.round(s[Math.floor(s.length / 2)]); };
dirs.forEach((d, k) => console.log(d, 'answer', med(res[k].a), 'fcp', med(res[k].p), 'fcp runs', res[k].p.map(Math.round).join(',')));
await browser.close(); await Promise.all(srvs.map((s) => s.close()));
