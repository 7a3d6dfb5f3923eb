//! Cross-engine: a design saved in local storage is found again after a reload; unsaved edits
//! survive a reload; a share link opens the design in a fresh profile, keeps the receiver's
//! unsaved work aside (one click brings it back), and an edited link is refused with its reason.
import assert from 'node:assert/strict';
import { journey, tid, text, textOf, value, field, retype, waitFor, assertClean, screenshot, waitForApp } from './kit.mjs';

/** Wait until some local-storage key starting with `prefix` holds `needle`. */
const stored = (page, prefix, needle) =>
  waitFor(
    page,
    (p, n) => Object.keys(localStorage).some((k) => k.startsWith(p) && localStorage.getItem(k).includes(n)),
    [prefix, needle],
    { what: `a ${prefix}* key holding "${needle}"` },
  );

const rowNames = (page) =>
  page.evaluate(() => [...document.querySelectorAll('tr[data-testid^="design-row-"] [data-testid="design-row-name"]')].map((e) => e.textContent));

/** Name the working design (the name box is a hook, not a number field). */
async function name(page, n) {
  await retype(page, tid('design-name-input'), n, 'Tab');
  await waitFor(page, (s, v) => document.querySelector(s)?.textContent.includes(v), [tid('design-name'), n], { what: `design named ${n}` });
}

journey('save, reload, and unsaved edits survive a reload', async ({ serve, open }) => {
  const srv = await serve();
  const page = await open(srv.url('/'));
  await waitFor(page, (s) => !!document.querySelector(s), [tid('designs-panel')], { what: 'the designs panel' });
  const ph = await field(page, 'Target pH');
  await retype(page, ph, '6.8', 'Tab');
  await name(page, 'Wash buffer A');
  await page.click(tid('save-design'));
  await waitFor(page, () => [...document.querySelectorAll('[data-testid="design-row-name"]')].some((e) => e.textContent === 'Wash buffer A'), [], { what: 'the saved row' });
  // The saved document is the solver's design with its schema, under its own key.
  const doc = await page.evaluate(() => {
    const index = JSON.parse(localStorage.getItem('bufferwright.index'));
    return JSON.parse(localStorage.getItem(`bufferwright.design.${index.ids[0]}`));
  });
  assert.equal(doc.name, 'Wash buffer A');
  assert.equal(doc.recipe.target_ph, 6.8);
  assert.ok(Number.isInteger(doc.schema) && doc.schema >= 2, `schema ${doc.schema}`);

  await page.reload();
  await waitForApp(page);
  await waitFor(page, (s) => !!document.querySelector(s), [tid('designs-panel')], { what: 'the designs panel' });
  assert.deepEqual(await rowNames(page), ['Wash buffer A']);
  assert.equal(await value(page, ph), '6.8');
  assert.match(await textOf(page, tid('design-status')), /Showing saved design “Wash buffer A”/);

  // Edited, not saved: the tab's draft keeps it over a reload and says it is unsaved.
  await retype(page, ph, '7.1', 'Tab');
  await stored(page, 'bufferwright.tabdraft.', '7.1');
  await page.reload();
  await waitForApp(page);
  await waitFor(page, (s) => document.querySelector(s)?.value === '7.1', [ph], { what: 'the unsaved 7.1 back' });
  assert.match(await textOf(page, tid('design-status')), /Unsaved changes to “Wash buffer A”/);
  await screenshot(page, 'designs');
  await assertClean(page, 'save and reload');
});

journey('a share link round trip, unsaved work kept aside, an edited link refused', async ({ serve, open }) => {
  const srv = await serve();
  // The sender makes the link.
  const sender = await open(srv.url('/'));
  const ph = await field(sender, 'Target pH');
  await retype(sender, ph, '6.9', 'Tab');
  await name(sender, 'Field kit — carbonate check');
  const link = await waitFor(sender, (s) => document.querySelector(s)?.value || null, [tid('share-link')], { what: 'the share link' });
  assert.match(link, /#z=[A-Za-z0-9_-]+\.[0-9a-f]{8}$/);
  assert.ok(link.startsWith(`${srv.origin}/#z=`), link);
  await assertClean(sender, 'sender');
  await sender.close();

  // The receiver, in a fresh profile, has unsaved work of their own, then opens the link.
  const page = await open(srv.url('/'), { width: 768, height: 1024 });
  await retype(page, ph, '5.5', 'Tab');
  await name(page, 'My half-finished buffer');
  await stored(page, 'bufferwright.tabdraft.', 'My half-finished buffer');
  await page.goto(link);
  await waitFor(page, (s) => document.querySelector(s)?.value === '6.9', [ph], { what: 'the linked design' });
  assert.equal(await value(page, tid('design-name-input')), 'Field kit — carbonate check');
  assert.match(await textOf(page, tid('storage-message')), /previous unsaved work was kept aside/);
  // The fragment is dropped from the address so a reload shows later edits.
  await waitFor(page, () => location.hash === '', [], { what: 'the fragment dropped' });
  await page.click(tid('restore-previous'));
  await waitFor(page, (s) => document.querySelector(s)?.value === '5.5', [ph], { what: 'the work brought back' });
  assert.equal(await value(page, tid('design-name-input')), 'My half-finished buffer');
  await screenshot(page, 'share-restored');
  await assertClean(page, 'receiver');

  // An edited link (one character of the payload changed) is refused with its reason.
  const i = link.indexOf('#z=') + 20;
  const edited = link.slice(0, i) + (link[i] === 'A' ? 'B' : 'A') + link.slice(i + 1);
  const bad = await open(edited);
  assert.match(await textOf(bad, tid('storage-message')), /does not match its check|could not be opened/);
  assert.equal(await value(bad, await field(bad, 'Buffer concentration')), '50', 'the edited amounts are not shown');
  assert.notEqual(await text(bad, tid('design-name')), null);
  assert.doesNotMatch(await text(bad, tid('design-name')), /carbonate check/);
  await assertClean(bad, 'edited link');
});
