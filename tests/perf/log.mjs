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
  await page.fill('[data-testid="field-log-text"]', csv);
  const t0 = Date.now();
  await page.click('[data-testid="field-log-read"]');
  await page.waitForSelector('[data-testid="field-log-progress"][data-running="false"][data-done="10000"]', { timeout: 300_000 });
  console.log(`10000 rows: ${Date.now() - t0} ms (wall, incl. parse and first paint of the table)`);
} finally {
  await s.close();
  await srv.close();
}
