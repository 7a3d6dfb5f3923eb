// Import timing: 4,000 designs (about 3.2 MB) into an empty browser, and a refused import that
// runs out of storage (figures in app/PERF.md). A measurement script, not a test.
// Usage, after a release build: node tests/perf/import.mjs [dist-dir] [count]   (default: dist/, 4000)
import { startServer } from '../e2e/server.mjs';
import { launchChromium } from '../e2e/browser.mjs';
import { readFile } from 'node:fs/promises';

const root = process.argv[2] || new URL('../../dist', import.meta.url).pathname;
const count = Number(process.argv[3] || 4000);
const srv = await startServer({ root, port: 0 });
const browser = await launchChromium();
const tid = (id) => `[data-testid="${id}"]`;

let cdp;
async function busy() {
  const { metrics } = await cdp.send('Performance.getMetrics');
  return metrics.find((m) => m.name === 'TaskDuration').value * 1000;
}

async function timeImport(page, name, text, done) {
  // The user's clock starts when the file is chosen (the input's change event, in the page) and
  // stops when the message is shown and the list drawn. Handing the file to the browser from this
  // script (a few MB through the debugging protocol) is not part of it; the wall time including
  // it is printed beside.
  await page.evaluate(() => {
    window.__chosenAt = undefined;
    document.querySelector('[data-testid="import-file"]').addEventListener('change', () => { window.__chosenAt = performance.now(); }, { capture: true, once: true });
  });
  const b0 = await busy();
  const t0 = Date.now();
  await page.setInputFiles(tid('import-file'), { name, mimeType: 'application/json', buffer: Buffer.from(text) });
  await page.waitForFunction((re) => new RegExp(re).test(document.querySelector('[data-testid="storage-message"]').textContent), done, { timeout: 300_000 });
  // Let the list render before stopping the clock.
  const user = await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => setTimeout(() => r(performance.now() - window.__chosenAt), 0))));
  const wall = Date.now() - t0;
  return `${Math.round(user)} ms from choosing the file (${wall} ms wall including the transfer from this script, ${Math.round((await busy()) - b0)} ms main-thread busy)`;
}

// A fixed JavaScript reference (parse the file, write 4,000 keys) shows how loaded the machine is.
try {
  const ctx = await browser.newContext({ viewport: { width: 1366, height: 768 }, serviceWorkers: 'block', acceptDownloads: true });
  const page = await ctx.newPage();
  cdp = await ctx.newCDPSession(page);
  await cdp.send('Performance.enable');
  await page.goto(srv.url('/'));
  await page.waitForSelector(tid('designs-panel'));
  const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
  const one = JSON.parse(await readFile(await dl.path(), 'utf8'));
  const designs = Array.from({ length: count }, (_, i) => ({ ...one, name: `Imported design ${i + 1}`, saved_at_ms: 1_700_000_000_000 + i }));
  const file = JSON.stringify({ format: 'bufferwright-designs', schema: 1, designs });
  const ref = await page.evaluate((text) => {
    const t0 = performance.now();
    const v = JSON.parse(text);
    v.designs.forEach((d, i) => localStorage.setItem(`ref.${i}`, JSON.stringify(d)));
    const t = performance.now() - t0;
    localStorage.clear();
    return Math.round(t);
  }, file);
  console.log(`reference (JS: parse the file, write ${count} keys): ${ref} ms`);
  const ms = await timeImport(page, 'many.bwdesign.json', file, `Imported ${count} designs`);
  const rows = await page.$$eval('tr[data-testid^="design-row-"]', (r) => r.length);
  console.log(`import ${count} designs (${(file.length / 1e6).toFixed(2)} MB): ${ms} (click to message + list drawn; ${rows} rows)`);

  // Half as many again as the first file, all new (names stay within the 120-character limit, so the file is valid):
  // with the first import already stored, this passes the browser's storage quota part-way.
  const more = [...designs, ...designs.slice(0, designs.length / 2)].map((d, i) => ({ ...d, name: `Second batch ${i + 1}`, saved_at_ms: 1_710_000_000_000 + i }));
  const big = JSON.stringify({ format: 'bufferwright-designs', schema: 1, designs: more });
  const refused = await timeImport(page, 'too-many.bwdesign.json', big, 'was not imported');
  const why = (await page.textContent(tid('storage-message'))).split('×')[0];
  console.log(`refused import that fills storage (${more.length} designs, ${(big.length / 1e6).toFixed(2)} MB): ${refused} to its message: ${why}`);
} finally {
  await browser.close();
  await srv.close();
}
