// Timing script (not a test): 10,000 log rows computed in the browser, chunked per frame.
// Usage: node tests/perf/log.mjs   (needs a built dist/)
import { serveDist, openSession, waitForApp } from '../e2e/harness.mjs';

const rows = ['time,pH,temp C,TAN mg/L'];
for (let i = 0; i < 10000; i++) rows.push(`${i},${(7 + (i % 200) / 100).toFixed(2)},${(18 + (i % 10)).toFixed(1)},1.2`);
const csv = rows.join('\n') + '\n';

const srv = await serveDist();
const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
try {
  const page = await s.newPage();
  await page.goto(srv.url('/?ws=field'));
  await waitForApp(page);
  // Put the text in as one paste would (one input event). Playwright's fill() of 180 KB takes
  // minutes in Chromium's text input path (3,000 rows: 31 s) and is not what a user does.
  const paste = (text) =>
    page.$eval('[data-testid="field-log-text"]', (el, t) => {
      el.value = t;
      el.dispatchEvent(new Event('input', { bubbles: true }));
    }, text);
  const runs = Number(process.env.RUNS || 5);
  const times = [];
  for (let r = 0; r < runs; r++) {
    await paste(r % 2 ? csv + '\n' : csv); // a changed text each run: no cached result
    const t0 = Date.now();
    await page.click('[data-testid="field-log-read"]');
    await page.waitForSelector('[data-testid="field-log-progress"][data-running="false"][data-done="10000"]', { timeout: 300_000 });
    times.push(Date.now() - t0);
  }
  times.sort((a, b) => a - b);
  console.log(`10000 rows: median ${times[times.length >> 1]} ms over ${runs} runs [${times.join(', ')}] (wall, from the click to the last chunk done, incl. parse and the table's paint)`);
} finally {
  await s.close();
  await srv.close();
}
