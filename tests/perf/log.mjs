// Timing script (not a test): a day's log computed in the browser.
// 1. 10,000 rows, RUNS times (default 5): click → last row computed, median.
// 2. 100,000 rows once (ROWS_LONG to change, 0 to skip): total time, the longest main-thread
//    task (PerformanceObserver 'longtask'), the longest gap between animation frames and the
//    progress values the page showed while it ran.
// Usage: node tests/perf/log.mjs   (needs a built dist/: bash scripts/build.sh)
import { serveDist, openSession, waitForApp } from '../e2e/harness.mjs';

const logText = (n) => {
  const rows = ['time,pH,temp C,TAN mg/L'];
  for (let i = 0; i < n; i++) rows.push(`${i},${(7 + (i % 200) / 100).toFixed(2)},${(18 + (i % 10)).toFixed(1)},1.2`);
  return rows.join('\n') + '\n';
};

const PROGRESS = '[data-testid="field-log-progress"]';

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

  // In the page: from the click (capture listener) to the progress line saying all `n` rows are
  // done (MutationObserver), and to the first frame painted after that (rAF, then a task).
  const arm = (n) =>
    page.evaluate(({ n, sel }) => {
      const st = { t0: null, done: null, painted: null, frames: [], seen: [], longtasks: [] };
      window.__logRun = st;
      const btn = document.querySelector('[data-testid="field-log-read"]');
      btn.addEventListener('click', () => { st.t0 = performance.now(); }, { capture: true, once: true });
      const el = document.querySelector(sel);
      const mo = new MutationObserver(() => {
        if (st.done === null && el.dataset.running === 'false' && Number(el.dataset.done) === n) {
          st.done = performance.now();
          mo.disconnect();
          requestAnimationFrame(() => setTimeout(() => { st.painted = performance.now(); }, 0));
        }
      });
      mo.observe(el, { attributes: true });
      // Frames while it runs: their times and the progress shown at each.
      const tick = () => {
        if (st.t0 !== null) {
          st.frames.push(performance.now());
          const d = Number(el.dataset.done);
          if (st.seen[st.seen.length - 1] !== d) st.seen.push(d);
        }
        if (st.painted === null) requestAnimationFrame(tick);
      };
      requestAnimationFrame(tick);
      try {
        const po = new PerformanceObserver((list) => {
          for (const e of list.getEntries()) st.longtasks.push({ start: e.startTime, ms: e.duration });
        });
        po.observe({ type: 'longtask' });
        st.po = po;
      } catch { st.longtasks = null; }
      // Long animation frames (Chromium): how much of a long frame is script, how much rendering.
      st.loafs = [];
      try {
        const lo = new PerformanceObserver((list) => {
          for (const e of list.getEntries()) {
            st.loafs.push({
              start: e.startTime,
              ms: e.duration,
              render: e.startTime + e.duration - (e.renderStart || e.startTime + e.duration),
              layout: e.startTime + e.duration - (e.styleAndLayoutStart || e.startTime + e.duration),
              blocking: e.blockingDuration,
            });
          }
        });
        lo.observe({ type: 'long-animation-frame' });
        st.lo = lo;
      } catch { st.loafs = null; }
    }, { n, sel: PROGRESS });

  const finish = async (n, timeout, t0) => {
    await page.waitForSelector(`${PROGRESS}[data-running="false"][data-done="${n}"]`, { timeout });
    const wall = Date.now() - t0;
    await page.waitForFunction(() => window.__logRun.painted !== null, null, { timeout: 30_000 });
    const m = await page.evaluate(() => {
      const st = window.__logRun;
      st.po?.disconnect();
      st.lo?.disconnect();
      const loafs = (st.loafs || []).filter((f) => f.start + f.ms >= st.t0).map((f) =>
        `${Math.round(f.ms)} ms at +${Math.round(f.start - st.t0)} (rendering ${Math.round(f.render)}, style+layout ${Math.round(f.layout)})`);
      const during = (st.longtasks || []).filter((t) => t.start + t.ms >= st.t0)
        .map((t) => ({ at: Math.round(t.start - st.t0), ms: Math.round(t.ms) }));
      let gap = 0;
      const fr = [st.t0, ...st.frames];
      for (let i = 1; i < fr.length; i++) gap = Math.max(gap, fr[i] - fr[i - 1]);
      return {
        wall: 0,
        done: st.done - st.t0,
        painted: st.painted - st.t0,
        frames: st.frames.length,
        maxFrameGap: gap,
        progressShown: st.seen.filter((d) => d < Number(document.querySelector('[data-testid="field-log-progress"]').dataset.total)).length,
        longtasks: st.longtasks === null ? null : during.map((t) => t.ms),
        longtaskAt: during.map((t) => `${t.ms} ms at +${t.at}`),
        loafs: st.loafs === null ? null : loafs,
      };
    });
    return { ...m, wall };
  };

  const N = 10_000;
  const csv = logText(N);
  const runs = Number(process.env.RUNS || 5);
  const wall = [];
  const inPage = [];
  for (let r = 0; r < runs; r++) {
    await paste(r % 2 ? csv + '\n' : csv); // a changed text each run: no cached result
    await arm(N);
    const t0 = Date.now();
    await page.click('[data-testid="field-log-read"]');
    const m = await finish(N, 300_000, t0);
    wall.push(m.wall);
    inPage.push(m);
  }
  const med = (xs) => [...xs].sort((a, b) => a - b)[xs.length >> 1];
  const r0 = (x) => Math.round(x);
  console.log(`${N} rows, ${runs} runs:`);
  console.log(`  wall (Node: click sent → progress says done, seen by Playwright): median ${med(wall)} ms [${wall.join(', ')}]`);
  console.log(`  in page (click → last row done): median ${r0(med(inPage.map((m) => m.done)))} ms [${inPage.map((m) => r0(m.done)).join(', ')}]`);
  console.log(`  in page (click → next frame painted): median ${r0(med(inPage.map((m) => m.painted)))} ms [${inPage.map((m) => r0(m.painted)).join(', ')}]`);
  console.log(`  long tasks (≥ 50 ms) per run: ${inPage.map((m) => JSON.stringify(m.longtasks)).join(' ')}`);

  const LONG = Number(process.env.ROWS_LONG ?? 100_000);
  if (LONG > 0) {
    await paste(logText(LONG));
    await arm(LONG);
    const t0 = Date.now();
    await page.click('[data-testid="field-log-read"]');
    const m = await finish(LONG, 600_000, t0);
    const wallLong = m.wall;
    const lt = m.longtasks || [];
    console.log(`${LONG} rows: wall ${wallLong} ms; in page click → done ${r0(m.done)} ms, → painted ${r0(m.painted)} ms`);
    console.log(`  ${m.frames} animation frames while it ran, longest gap between frames ${r0(m.maxFrameGap)} ms; ` +
      `${m.progressShown} different progress counts shown before the end`);
    console.log(`  long tasks (≥ 50 ms): ${m.longtasks === null ? 'observer not supported' : `${lt.length}, longest ${lt.length ? Math.max(...lt) : 0} ms [${m.longtaskAt.join(', ')}]`}`);
    console.log(`  long animation frames (≥ 50 ms): ${m.loafs === null ? 'observer not supported' : `${m.loafs.length} [${m.loafs.join('; ')}]`}`);
  }
} finally {
  await s.close();
  await srv.close();
}
