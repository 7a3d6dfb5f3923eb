// Cold start: time from navigation to the first answer on screen (the recipe's headline answer,
// `[data-testid="answer"]`, holding a pH), on a first visit (empty cache) and from the cache
// (second visit of the same browser profile), with Chromium's CPU throttled ×4 at 768×1024, DPR 2.
// Two figures per visit: when the answer is in the page (a MutationObserver sees it) and when
// the frame showing it is painted (first contentful paint: the page's first view, answer
// included, goes in at once), the headline figure.
// A measurement script, not a test: figures go to app/PERF.md and the README.
// Usage, after a release build: node tests/perf/coldstart.mjs [dist-dir] [runs]   (default: dist/, 7)
import { startServer } from '../e2e/server.mjs';
import { launchChromium } from '../e2e/browser.mjs';
import { loadavg } from 'node:os';

const root = process.argv[2] || new URL('../../dist', import.meta.url).pathname;
const runs = Number(process.argv[3] || 7);
const srv = await startServer({ root, port: 0 });
const browser = await launchChromium();

// Runs in the page before any of its scripts: note performance.now() (ms since navigation
// start) when the headline answer first shows a pH.
const WATCH = () => {
  const seen = () => /pH\s*\d/.test(document.querySelector('[data-testid="answer"]')?.textContent || '');
  const obs = new MutationObserver(() => {
    if (window.__answerAt === undefined && seen()) {
      window.__answerAt = performance.now();
      obs.disconnect();
      // The frame that shows it: the page puts its whole first view in at once, so the first
      // contentful paint (Paint Timing) is the first frame with the answer in it.
      new PerformanceObserver((list) => {
        const fcp = list.getEntries().find((e) => e.name === 'first-contentful-paint');
        if (fcp && window.__paintedAt === undefined) window.__paintedAt = fcp.startTime;
      }).observe({ type: 'paint', buffered: true });
    }
  });
  document.addEventListener('DOMContentLoaded', () => obs.observe(document.body, { childList: true, subtree: true, characterData: true }));
};

async function visit(page) {
  await page.goto(srv.url('/'));
  await page.waitForFunction(() => window.__paintedAt !== undefined, null, { timeout: 60_000 });
  return page.evaluate(() => [window.__answerAt, window.__paintedAt]);
}

const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const first = [];
const cached = [];
try {
  for (let i = 0; i < runs; i++) {
    // A new context is a new profile: empty HTTP cache, no service worker.
    const ctx = await browser.newContext({ viewport: { width: 768, height: 1024 }, deviceScaleFactor: 2 });
    await ctx.addInitScript(WATCH);
    const page = await ctx.newPage();
    const cdp = await ctx.newCDPSession(page);
    await cdp.send('Emulation.setCPUThrottlingRate', { rate: 4 });
    first.push(await visit(page));
    // Let the service worker install and the cache fill, then come back.
    await page.waitForTimeout(1500);
    cached.push(await visit(page));
    await ctx.close();
  }
  const fmt = (xs) => `median ${Math.round(median(xs))} ms (runs: ${xs.map(Math.round).join(', ')})`;
  const at = (xs, i) => xs.map((x) => x[i]);
  console.log(`load average at start of summary: ${loadavg().map((x) => x.toFixed(1)).join(' ')}`);
  console.log(`first visit, CPU ×4, 768×1024 DPR 2, loopback: answer in the page ${fmt(at(first, 0))}`);
  console.log(`  its frame painted: ${fmt(at(first, 1))}`);
  console.log(`second visit (cache), CPU ×4: answer in the page ${fmt(at(cached, 0))}`);
  console.log(`  its frame painted: ${fmt(at(cached, 1))}`);
} finally {
  await browser.close();
  await srv.close();
}
