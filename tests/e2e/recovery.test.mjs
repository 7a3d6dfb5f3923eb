// Unsaved work is never lost: work set aside by share links stays listed (every piece, over
// reloads), each tab keeps its own draft, the status line never claims work is kept when storage
// refuses, old single-draft keys are taken over, damaged entries are listed in plain words with
// open/export/delete, an editable embed says its changes are not kept, and a large import is
// written correctly (all or nothing). Timing is measured by tests/perf/import.mjs, not here.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFile } from 'node:fs/promises';
import { serveDist, openSession, waitForApp, screenshot, tid, storageSnapshot, openApp } from './harness.mjs';

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

const PH = '#recipe-ph';

const openPage = (s, url = srv.url('/')) => openApp(s, url);

async function setWork(page, name, ph) {
  await page.fill(PH, String(ph));
  await page.fill(tid('design-name-input'), name);
  // Autosave runs on the change; wait until this tab's draft holds the name.
  await page.waitForFunction(
    (n) => Object.keys(localStorage).some((k) => k.startsWith('bufferwright.tabdraft.') && localStorage.getItem(k).includes(n)),
    name,
  );
}

async function recoveryTitles(page) {
  return page.$$eval('[data-testid^="recovery-item-"] [data-testid="recovery-title"]', (els) => els.map((e) => e.textContent));
}

async function makeLink(name, ph) {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await page.fill(PH, String(ph));
    await page.fill(tid('design-name-input'), name);
    await page.waitForFunction((n) => document.querySelector('[data-testid="share-link"]').value.length > 0 && document.querySelector('[data-testid="design-name-input"]').value === n, name);
    await page.waitForTimeout(200);
    return await page.inputValue(tid('share-link'));
  } finally {
    await s.close();
  }
}

test('a second share link does not destroy work set aside by the first; it stays listed after a reload', async () => {
  const link1 = await makeLink('Link one', 8.2);
  const link2 = await makeLink('Link two', 6.3);
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await setWork(page, 'My original buffer', 5.5);
    await page.goto(link1);
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '8.2');
    assert.match(await page.textContent(tid('storage-message')), /previous unsaved work was kept aside/);
    // Link 1's design is changed a little (it becomes work of its own), then link 2 opens.
    await setWork(page, 'Link one, adjusted', 8.1);
    await page.goto(link2);
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '6.3');
    // The original is still stored, in a set-aside key.
    const store = await storageSnapshot(page);
    const aside = Object.entries(store).filter(([k]) => k.startsWith('bufferwright.setaside.'));
    assert.ok(aside.some(([, v]) => v.includes('My original buffer')), 'original kept');
    assert.ok(aside.some(([, v]) => v.includes('Link one, adjusted')), 'adjusted link design kept');
    // "Bring back my previous work" brings the work link 2 replaced.
    await page.click(tid('restore-previous'));
    await page.waitForFunction((sel) => document.querySelector(sel).value === '8.1', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'Link one, adjusted');

    // After a reload the original is still reachable, under Recovery.
    await page.reload();
    await waitForApp(page);
    await page.waitForSelector(tid('recovery'));
    assert.ok((await recoveryTitles(page)).includes('My original buffer'));
    await screenshot(page, 'recovery-set-aside-desktop');
    const item = page.locator('[data-testid^="recovery-item-"]', { has: page.locator('[data-testid="recovery-title"]:text-is("My original buffer")') });
    await item.locator(tid('recovery-open')).click();
    await page.waitForFunction((sel) => document.querySelector(sel).value === '5.5', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'My original buffer');
    // What was on screen (the adjusted link design) was set aside in its turn, not lost.
    await page.waitForFunction(() => [...document.querySelectorAll('[data-testid="recovery-title"]')].some((e) => e.textContent === 'Link one, adjusted'));
    s.assertClean('set-aside list');
  } finally {
    await s.close();
  }
});

test('opening a saved design keeps the unsaved work on screen aside, one click brings it back', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await page.fill(PH, '6.8');
    await page.fill(tid('design-name-input'), 'Saved wash');
    await page.click(tid('save-design'));
    await page.waitForFunction(() => [...document.querySelectorAll('[data-testid="design-row-name"]')].some((e) => e.textContent === 'Saved wash'));
    // New work on top of it, never saved.
    await setWork(page, 'Unsaved column buffer', 5.2);
    const row = page.locator('tr[data-testid^="design-row-"]', { has: page.locator('[data-testid="design-row-name"]:text-is("Saved wash")') });
    await row.locator(tid('open-design')).click();
    await page.waitForFunction((sel) => document.querySelector(sel).value === '6.8', PH);
    assert.match(await page.textContent(tid('storage-message')), /Opened “Saved wash”\. Your unsaved work was kept aside/);
    const aside = Object.entries(await storageSnapshot(page)).filter(([k]) => k.startsWith('bufferwright.setaside.'));
    assert.ok(aside.some(([, v]) => v.includes('Unsaved column buffer')), 'the unsaved work is stored aside');
    await page.click(tid('restore-previous'));
    await page.waitForFunction((sel) => document.querySelector(sel).value === '5.2', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'Unsaved column buffer');
    // Opening it again while it is on screen unchanged sets nothing more aside.
    const asideCount = async () => Object.keys(await storageSnapshot(page)).filter((k) => k.startsWith('bufferwright.setaside.')).length;
    await row.locator(tid('open-design')).click();
    await page.waitForFunction((sel) => document.querySelector(sel).value === '6.8', PH);
    const before = await asideCount();
    await row.locator(tid('open-design')).click();
    await page.waitForTimeout(300);
    assert.equal(await asideCount(), before, 'an unchanged saved design is not set aside');
    s.assertClean('open saved design');
  } finally {
    await s.close();
  }
});

test('two tabs keep separate drafts: closing one and opening the page again brings its work back', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const a = await openPage(s);
    const b = await openPage(s);
    await setWork(a, 'Tab A work', 5.1);
    await setWork(b, 'Tab B work', 9.1);
    const drafts = Object.entries(await storageSnapshot(b)).filter(([k]) => k.startsWith('bufferwright.tabdraft.'));
    assert.equal(drafts.length, 2, 'one draft per tab');
    assert.match(await a.textContent(tid('design-status')), /kept automatically/);
    await a.close({ runBeforeUnload: true });
    // B edits again after A closed: A's draft must survive that.
    await setWork(b, 'Tab B work, later', 9.2);
    const c = await openPage(s);
    await c.waitForFunction((sel) => document.querySelector(sel).value === '5.1', PH);
    assert.equal(await c.inputValue(tid('design-name-input')), 'Tab A work');
    assert.match(await c.textContent(tid('storage-message')), /from a tab that was closed is back/);
    // B's own work is untouched by all this.
    await b.reload();
    await waitForApp(b);
    assert.equal(await b.inputValue(tid('design-name-input')), 'Tab B work, later');
    assert.equal(await b.inputValue(PH), '9.2');
    s.assertClean('two drafts');
  } finally {
    await s.close();
  }
});

test('when storage refuses writes the status line says the work is not kept', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(s);
    await setWork(page, 'Before the disk filled', 7.0);
    assert.match(await page.textContent(tid('design-status')), /Your work is kept automatically/);
    await page.evaluate(() => {
      let n = 0;
      for (let size = 1 << 20; size >= 4; size >>= 1) {
        const chunk = 'x'.repeat(size);
        for (;;) {
          try {
            localStorage.setItem(`filler.${n}`, chunk);
            n++;
          } catch {
            break;
          }
        }
      }
    });
    await page.fill(PH, '7.35');
    await page.fill(tid('design-name-input'), 'A much longer name so the draft grows past what is left');
    await page.waitForFunction(() => /can no longer be kept/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    const status = await page.textContent(tid('design-status'));
    assert.match(status, /NOT kept automatically/);
    assert.doesNotMatch(status, /is kept automatically/);
    await screenshot(page, 'recovery-not-kept-tablet');
    await page.evaluate(() => {
      for (const k of Object.keys(localStorage)) if (k.startsWith('filler.')) localStorage.removeItem(k);
    });
    await page.fill(PH, '7.3');
    await page.waitForFunction(() => /Your work is kept automatically/.test(document.querySelector('[data-testid="design-status"]').textContent));
    s.assertClean('not kept');
  } finally {
    await s.close();
  }
});

test('old single-draft keys are recovered: the draft opens in a new tab, the set-aside one is listed', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const first = await openPage(s);
    await setWork(first, 'Scratch', 7.0);
    // Write the keys an older version of the page used.
    await first.evaluate(() => {
      const key = Object.keys(localStorage).find((k) => k.startsWith('bufferwright.tabdraft.'));
      const rec = JSON.parse(localStorage.getItem(key));
      const old = (name, ph) => {
        const design = { ...rec.design, name, recipe: { ...rec.design.recipe, target_ph: ph } };
        return JSON.stringify({ schema: 1, open_id: null, base_saved_at_ms: 0, dirty: true, design });
      };
      localStorage.setItem('bufferwright.draft', old('From the old page', 6.15));
      localStorage.setItem('bufferwright.draft.previous', old('Set aside by the old page', 5.25));
    });
    const page = await openPage(s);
    await page.waitForFunction((sel) => document.querySelector(sel).value === '6.15', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'From the old page');
    const store = await storageSnapshot(page);
    assert.equal(store['bufferwright.draft'], undefined);
    assert.equal(store['bufferwright.draft.previous'], undefined);
    assert.ok((await recoveryTitles(page)).includes('Set aside by the old page'));
    s.assertClean('legacy draft');
  } finally {
    await s.close();
  }
});

test('damaged entries are listed under Recovery in plain words, with export and delete (undo)', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await page.fill(tid('design-name-input'), 'Second');
    await page.click(tid('save-design'));
    await page.waitForSelector(tid('design-row-0'));
    const id = JSON.parse(await page.evaluate(() => localStorage.getItem('bufferwright.index'))).ids[0];
    await page.evaluate((i) => {
      localStorage.setItem(`bufferwright.design.${i}`, '{"schema":1,"name":"Sec');
      localStorage.setItem('bufferwright.tabdraft.tzz-closed', '{"schema":1,"design":{"name":"Half');
    }, id);
    await page.reload();
    await waitForApp(page);
    await page.waitForSelector(tid('recovery'));
    const msg = await page.textContent(tid('storage-message'));
    assert.match(msg, /A draft \(unsaved work kept automatically\) could not be read/);
    const items = await page.$$eval('[data-testid^="recovery-item-"]', (els) => els.map((e) => e.innerText));
    const saved = items.find((t) => /damaged saved design/.test(t));
    const draft = items.find((t) => /damaged draft/.test(t));
    assert.ok(saved && draft, items.join('\n'));
    assert.match(saved, /“Sec”/);
    assert.match(saved, /cut short/);
    for (const t of items) assert.doesNotMatch(t, /`|missing field/);
    await screenshot(page, 'recovery-damaged-desktop');
    const row = page.locator('[data-testid^="recovery-item-"]', { hasText: 'damaged saved design' });
    const [dl] = await Promise.all([page.waitForEvent('download'), row.locator(tid('recovery-export')).click()]);
    assert.equal(await readFile(await dl.path(), 'utf8'), '{"schema":1,"name":"Sec', 'exported exactly as stored');
    const before = await storageSnapshot(page);
    await row.locator(tid('recovery-delete')).click();
    await page.waitForFunction(() => ![...document.querySelectorAll('[data-testid^="recovery-item-"]')].some((e) => /damaged saved design/.test(e.innerText)));
    assert.equal((await storageSnapshot(page))[`bufferwright.quarantine.${id}`], undefined);
    await page.click(tid('undo-recovery-delete'));
    await page.waitForFunction(() => [...document.querySelectorAll('[data-testid^="recovery-item-"]')].some((e) => /damaged saved design/.test(e.innerText)));
    assert.equal((await storageSnapshot(page))[`bufferwright.quarantine.${id}`], before[`bufferwright.quarantine.${id}`]);
    s.assertClean('damaged entries');
  } finally {
    await s.close();
  }
});

test('an editable embed says its changes are not kept; a read-only one does not need to', async () => {
  const link = await makeLink('Embedded example', 7.25);
  const frag = link.slice(link.indexOf('#'));
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s, `${srv.url('/')}?embed=1&ws=recipe${frag}`);
    const note = page.locator(tid('embed-not-kept'));
    await note.waitFor();
    assert.equal(await note.getAttribute('data-edited'), '0');
    assert.match(await note.innerText(), /not kept/);
    await page.fill(PH, '7.6');
    await page.waitForFunction(() => document.querySelector('[data-testid="embed-not-kept"]').getAttribute('data-edited') === '1');
    assert.match(await note.innerText(), /vanish on reload/);
    await screenshot(page, 'recovery-embed-edited');
    await page.reload();
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '7.25', 'the reload shows the original, as the bar said');
    await page.locator(tid('embed-not-kept')).waitFor();
    const ro = await openPage(s, `${srv.url('/')}?embed=1&readonly=1&ws=recipe${frag}`);
    await ro.locator(tid('embed-mode')).waitFor();
    assert.equal(await ro.$(tid('embed-not-kept')), null);
    s.assertClean('embed note');
  } finally {
    await s.close();
  }
});

test('importing 4,000 designs writes every one and the index once; a refused import changes nothing', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    const one = JSON.parse(await readFile(await dl.path(), 'utf8'));
    const designs = Array.from({ length: 4000 }, (_, i) => ({
      ...one,
      name: `Imported design ${String(i + 1).padStart(4, '0')}`,
      saved_at_ms: 1_700_000_000_000 + i,
    }));
    const file = JSON.stringify({ format: 'bufferwright-designs', schema: 1, designs });
    await page.setInputFiles(tid('import-file'), { name: 'many.bwdesign.json', mimeType: 'application/json', buffer: Buffer.from(file) });
    await page.waitForFunction(() => /Imported 4000 designs/.test(document.querySelector('[data-testid="storage-message"]').textContent), null, { timeout: 120_000 });
    const store = await storageSnapshot(page);
    const ids = JSON.parse(store['bufferwright.index']).ids;
    assert.equal(ids.length, 4000);
    assert.equal(new Set(ids).size, 4000);
    for (const i of ids) assert.ok(store[`bufferwright.design.${i}`], i);
    assert.equal(JSON.parse(store[`bufferwright.design.${ids[3999]}`]).name, 'Imported design 4000');

    // A second large file that does not fit: refused, nothing added, index untouched.
    const big = JSON.stringify({
      format: 'bufferwright-designs',
      schema: 1,
      designs: designs.map((d) => ({ ...d, name: `${d.name} bis ${'x'.repeat(100)}` })),
    });
    const before = await storageSnapshot(page);
    await page.setInputFiles(tid('import-file'), { name: 'too-many.bwdesign.json', mimeType: 'application/json', buffer: Buffer.from(big) });
    await page.waitForFunction(() => /was not imported/.test(document.querySelector('[data-testid="storage-message"]').textContent), null, { timeout: 120_000 });
    const after = await storageSnapshot(page);
    assert.deepEqual(Object.keys(after).filter((k) => k.startsWith('bufferwright.design.')).sort(), Object.keys(before).filter((k) => k.startsWith('bufferwright.design.')).sort());
    assert.equal(after['bufferwright.index'], before['bufferwright.index']);
    s.assertClean('large import');
  } finally {
    await s.close();
  }
});
