// Share links and embed presets: the whole design travels in the URL fragment (#z=...), opens in
// a fresh browser, keeps the receiver's unsaved work aside, refuses a broken link with a reason,
// and presets an embed (?embed=1&ws=...&readonly=1) without touching the receiver's draft.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { serveDist, openSession, waitForApp, screenshot, tid, openApp } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

const PH = '#recipe-ph';

/** Make a share link for a design named `name` with target pH `ph` in a throwaway browser. */
async function makeLink(name, ph) {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await page.fill(PH, String(ph));
    await page.fill(tid('design-name-input'), name);
    // The link is compressed and checked: wait until the page shows the name it carries.
    await page.waitForFunction(
      (n) => document.querySelector('[data-testid="design-name"]')?.textContent.includes(n),
      name,
    );
    const link = await page.inputValue(tid('share-link'));
    s.assertClean('making the link');
    return link;
  } finally {
    await s.close();
  }
}

test('a share link restores the design in a fresh browser', async () => {
  const link = await makeLink('Field kit — carbonate check', 6.9);
  assert.ok(link.startsWith(`${srv.origin}/#z=`), link);
  assert.ok(link.length < 2500, `link is ${link.length} characters`);

  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openApp(s, link);
    assert.equal(await page.inputValue(PH), '6.9');
    assert.equal(await page.inputValue(tid('design-name-input')), 'Field kit — carbonate check');
    // The fragment is dropped from the address bar so a reload shows later edits, not the link.
    assert.equal(new URL(page.url()).hash, '');
    // Opened, not saved: the receiver decides.
    assert.equal(await page.$$eval('tr[data-testid^="design-row-"]', (r) => r.length), 0);
    await page.fill(PH, '7.05');
    await page.reload();
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '7.05');
    await screenshot(page, 'share-opened-tablet');
    s.assertClean('share link');
  } finally {
    await s.close();
  }
});

test("opening a link keeps the receiver's unsaved work aside, one click brings it back", async () => {
  const link = await makeLink('From a colleague', 8.2);
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await page.fill(PH, '5.5');
    await page.fill(tid('design-name-input'), 'My half-finished buffer');
    await page.goto(link);
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '8.2');
    assert.match(await page.textContent(tid('storage-message')), /previous unsaved work was kept aside/);
    await page.click(tid('restore-previous'));
    await page.waitForFunction((sel) => document.querySelector(sel).value === '5.5', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'My half-finished buffer');
    s.assertClean('previous work');
  } finally {
    await s.close();
  }
});

test('a broken link is refused with a reason and the page still works', async () => {
  const link = await makeLink('Cut short', 7.7);
  const cut = link.slice(0, link.length - 37);
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, cut);
    assert.match(await page.textContent(tid('storage-message')), /The design in this link could not be opened/);
    assert.equal(await page.inputValue(PH), '7.4', 'the demo design is shown');
    const bad = await openApp(s, `${srv.url('/')}#d=not*base64`);
    assert.match(await bad.textContent(tid('storage-message')), /not allowed in a share link/);
    s.assertClean('broken link');
  } finally {
    await s.close();
  }
});

test('embed mode: preset design from the fragment, chosen workspace, read-only, draft untouched', async () => {
  const link = await makeLink('Embedded sample', 7.25);
  const frag = link.slice(link.indexOf('#'));
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    // The receiver has their own work on this origin.
    const own = await openApp(s, srv.url('/'));
    await own.fill(PH, '6.1');
    const draftBefore = await own.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('bufferwright.tabdraft.')).map((k) => localStorage.getItem(k)).join('\n') || null);
    assert.ok(draftBefore);

    const page = await openApp(s, `${srv.url('/')}?embed=1&ws=recipe&readonly=1${frag}`);
    const bar = page.locator(tid('embed-mode'));
    await bar.waitFor();
    assert.equal(await bar.getAttribute('data-workspace'), 'recipe');
    assert.equal(await bar.getAttribute('data-readonly'), '1');
    assert.match(await bar.innerText(), /Embedded sample/);
    assert.equal(await page.inputValue(PH), '7.25');
    assert.equal(await page.$(tid('designs-panel')), null, 'no designs panel in an embed');
    // The fragment stays (a reload of the iframe shows the same preset).
    assert.ok(page.url().includes('#z='));
    // "Open in Bufferwright" carries the design to the full page, without the embed options.
    const href = await bar.locator('a').getAttribute('href');
    assert.ok(href.startsWith(`${srv.origin}/#z=`), href);
    await screenshot(page, 'embed-preset-desktop');

    const field = await openApp(s, `${srv.url('/')}?embed=1&ws=field${frag}`);
    assert.equal(await field.locator(tid('embed-mode')).getAttribute('data-workspace'), 'field');

    // Neither embed wrote the receiver's draft.
    assert.equal(await own.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('bufferwright.tabdraft.')).map((k) => localStorage.getItem(k)).join('\n') || null), draftBefore);
    s.assertClean('embed preset');
  } finally {
    await s.close();
  }
});

test('embed in an iframe on another page shows the preset design', async () => {
  const link = await makeLink('Iframe preset', 6.75);
  const frag = link.slice(link.indexOf('#'));
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await s.newPage();
    await page.goto(srv.url('/embed-example.html'));
    const handle = await page.waitForSelector('iframe#bufferwright');
    await handle.evaluate((f, src) => {
      f.src = src;
    }, `index.html?embed=1&ws=recipe${frag}`);
    const frame = await handle.contentFrame();
    await frame.waitForURL(/embed=1/);
    await waitForApp(frame);
    await frame.waitForSelector(tid('embed-mode'));
    assert.equal(await frame.inputValue(PH), '6.75');
    assert.match(await frame.locator(tid('embed-mode')).innerText(), /Iframe preset/);
    await page.waitForTimeout(300);
    await screenshot(page, 'embed-iframe-preset-tablet');
    s.assertClean('iframe preset');
  } finally {
    await s.close();
  }
});
