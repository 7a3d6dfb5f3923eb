// Saved designs in the browser: save/reload, rename/duplicate/delete+undo, a corrupted entry set
// aside while the others load, a full storage quota, export/import round trip, a refused import,
// two tabs, and storage that cannot be used at all. Every test also checks that no request left
// the page's origin and that nothing was logged as an error.
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

async function openPage(s, path = '/') {
  const page = await openApp(s, srv.url(path));
  await page.waitForSelector(tid('designs-panel'));
  return page;
}

/** Set the working design's name and target pH, then save (as new when asked). */
async function saveDesign(page, name, ph, { asNew = false } = {}) {
  if (ph !== undefined) await page.fill(PH, String(ph));
  await page.fill(tid('design-name-input'), name);
  const button = asNew && (await page.isVisible(tid('save-as-new'))) ? 'save-as-new' : 'save-design';
  await page.click(tid(button));
  await page.waitForFunction(
    (n) => [...document.querySelectorAll('[data-testid^="design-row-"] [data-testid="design-row-name"]')].some((e) => e.textContent === n),
    name,
  );
}

async function rowNames(page) {
  return page.$$eval('tr[data-testid^="design-row-"] [data-testid="design-row-name"]', (els) => els.map((e) => e.textContent));
}

async function messages(page) {
  return page.textContent(tid('storage-message'));
}

async function rowByName(page, name) {
  return page.locator('tr[data-testid^="design-row-"]', { has: page.locator(`[data-testid="design-row-name"]:text-is("${name}")`) });
}

test('save, reload and find the design; unsaved edits survive a reload', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await saveDesign(page, 'Wash buffer A', 6.8);
    const row = page.locator(tid('design-row-0'));
    assert.match(await row.innerText(), /Wash buffer A[\s\S]*Phosphate[\s\S]*6\.80/);

    // The saved document is the solver's design, with its schema, under its own key.
    const store = await storageSnapshot(page);
    const index = JSON.parse(store['bufferwright.index']);
    assert.equal(index.ids.length, 1);
    const doc = JSON.parse(store[`bufferwright.design.${index.ids[0]}`]);
    assert.equal(doc.schema, 2);
    assert.equal(doc.name, 'Wash buffer A');
    assert.equal(doc.recipe.target_ph, 6.8);
    assert.ok(doc.saved_at_ms > 0);

    await page.reload();
    await waitForApp(page);
    assert.deepEqual(await rowNames(page), ['Wash buffer A']);
    assert.equal(await page.inputValue(PH), '6.8');
    assert.match(await page.textContent(tid('design-status')), /Showing saved design “Wash buffer A”/);

    // Edit without saving: the draft keeps it over a reload, and says it is unsaved.
    await page.fill(PH, '7.1');
    await page.reload();
    await waitForApp(page);
    assert.equal(await page.inputValue(PH), '7.1');
    assert.match(await page.textContent(tid('design-status')), /Unsaved changes to “Wash buffer A”/);

    // Save as a second design, then open the first again: every input comes back.
    await saveDesign(page, 'Wash buffer B', 7.1, { asNew: true });
    assert.deepEqual((await rowNames(page)).sort(), ['Wash buffer A', 'Wash buffer B']);
    await (await rowByName(page, 'Wash buffer A')).locator(tid('open-design')).click();
    await page.waitForFunction((sel) => document.querySelector(sel).value === '6.8', PH);
    assert.equal(await page.inputValue(tid('design-name-input')), 'Wash buffer A');
    await screenshot(page, 'designs-desktop');
    s.assertClean('save and reload');
  } finally {
    await s.close();
  }
});

test('rename, duplicate, delete and undo', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(s);
    await saveDesign(page, 'Tris wash', 7.6);
    const row = await rowByName(page, 'Tris wash');
    await row.locator(tid('rename-design')).click();
    // The name field takes the focus, its text selected, ready to type over.
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'rename-input');
    await page.fill(tid('rename-input'), 'Tris wash 20 mM');
    await page.press(tid('rename-input'), 'Enter');
    await page.waitForFunction(() => document.body.innerText.includes('Tris wash 20 mM'));
    // Focus stays on the row (its Rename button), not at the top of the page.
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'rename-design');
    assert.match(await page.evaluate(() => document.activeElement.getAttribute('aria-label')), /Rename “Tris wash 20 mM”/);
    // Renaming the open design renames the working design too.
    assert.equal(await page.inputValue(tid('design-name-input')), 'Tris wash 20 mM');

    await (await rowByName(page, 'Tris wash 20 mM')).locator(tid('duplicate-design')).click();
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    assert.deepEqual((await rowNames(page)).sort(), ['Tris wash 20 mM', 'Tris wash 20 mM (copy)']);

    const before = await storageSnapshot(page);
    await (await rowByName(page, 'Tris wash 20 mM (copy)')).locator(tid('delete-design')).click();
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 1);
    assert.match(await messages(page), /Deleted “Tris wash 20 mM \(copy\)”/);
    // The deleted row took the focus with it: focus moves to Undo, so the next key reaches it.
    await page.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'undo-delete');
    await screenshot(page, 'designs-tablet-deleted');
    await page.click(tid('undo-delete'));
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    const after = await storageSnapshot(page);
    // The copy is back exactly as it was (same key, same text).
    for (const [k, v] of Object.entries(before)) {
      if (k.startsWith('bufferwright.design.')) assert.equal(after[k], v, k);
    }
    // Deleting the open design and undoing links it again.
    await (await rowByName(page, 'Tris wash 20 mM')).locator(tid('delete-design')).click();
    assert.match(await page.textContent(tid('design-status')), /Not saved yet/);
    await page.click(tid('undo-delete'));
    await page.waitForFunction(() => /Showing saved design “Tris wash 20 mM”/.test(document.querySelector('[data-testid="design-status"]').textContent));
    // "Save as new" under the open design's own name saves a named copy.
    await page.click(tid('save-as-new'));
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 3);
    assert.deepEqual((await rowNames(page)).sort(), ['Tris wash 20 mM', 'Tris wash 20 mM (copy 2)', 'Tris wash 20 mM (copy)']);
    assert.equal(await page.inputValue(tid('design-name-input')), 'Tris wash 20 mM (copy 2)');
    s.assertClean('rename/duplicate/delete');
  } finally {
    await s.close();
  }
});

test('a corrupted entry is set aside and reported once; the others load', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await saveDesign(page, 'First', 7.0);
    await saveDesign(page, 'Second', 7.2, { asNew: true });
    await saveDesign(page, 'Third', 7.4, { asNew: true });
    const ids = JSON.parse(await page.evaluate(() => localStorage.getItem('bufferwright.index'))).ids;
    assert.equal(ids.length, 3);
    const victim = ids[1];
    await page.evaluate((id) => localStorage.setItem(`bufferwright.design.${id}`, '{"schema":1,"name":"Sec'), victim);

    await page.reload();
    await waitForApp(page);
    assert.deepEqual((await rowNames(page)).sort(), ['First', 'Third']);
    const msg = await messages(page);
    assert.match(msg, /could not be read/);
    assert.ok(!msg.includes('bufferwright.'), `plain words, no storage key: ${msg}`);
    assert.match(msg, /listed under Recovery/);
    await screenshot(page, 'designs-quarantine');
    const store = await storageSnapshot(page);
    assert.equal(store[`bufferwright.quarantine.${victim}`], '{"schema":1,"name":"Sec', 'kept, not deleted');
    assert.equal(store[`bufferwright.design.${victim}`], undefined);
    assert.ok(!JSON.parse(store['bufferwright.index']).ids.includes(victim));

    // Reported once: the next load is quiet.
    await page.reload();
    await waitForApp(page);
    assert.doesNotMatch(await messages(page), /could not be read/);
    assert.deepEqual((await rowNames(page)).sort(), ['First', 'Third']);
    s.assertClean('quarantine');
  } finally {
    await s.close();
  }
});

test('a full storage quota gives a clear message and writes nothing', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await saveDesign(page, 'Kept', 7.0);
    const filled = await page.evaluate(() => {
      let n = 0;
      for (let size = 1 << 20; size >= 16; size >>= 1) {
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
      return n;
    });
    assert.ok(filled > 0);
    const before = await storageSnapshot(page);

    await page.fill(tid('design-name-input'), 'Does not fit');
    await page.click(tid('save-as-new'));
    await page.waitForFunction(() => /storage is full/i.test(document.querySelector('[data-testid="storage-message"]').textContent));
    await screenshot(page, 'designs-quota');
    const after = await storageSnapshot(page);
    assert.deepEqual(Object.keys(after).sort(), Object.keys(before).sort(), 'no key added');
    assert.equal(after['bufferwright.index'], before['bufferwright.index'], 'index untouched');
    // The design stays on screen.
    assert.equal(await page.inputValue(tid('design-name-input')), 'Does not fit');
    assert.deepEqual(await rowNames(page), ['Kept']);

    // Space freed: the same click saves.
    await page.evaluate(() => {
      for (const k of Object.keys(localStorage)) if (k.startsWith('filler.')) localStorage.removeItem(k);
    });
    await page.click(tid('save-as-new'));
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    s.assertClean('quota');
  } finally {
    await s.close();
  }
});

test('export all and import into a fresh browser round-trips exactly; one design too', async () => {
  const a = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  let exported;
  let single;
  try {
    const page = await openPage(a);
    await saveDesign(page, 'Phosphate 7.20 — µ 0.1', 7.2);
    await saveDesign(page, 'Acetate for the field kit', 4.75, { asNew: true });
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-all'))]);
    assert.match(dl.suggestedFilename(), /^bufferwright-saved-designs-\d{4}-\d\d-\d\d\.bwdesign\.json$/);
    exported = await readFile(await dl.path(), 'utf8');
    const parsed = JSON.parse(exported);
    assert.equal(parsed.format, 'bufferwright-designs');
    assert.equal(parsed.designs.length, 2);
    const [dl1] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    assert.equal(dl1.suggestedFilename(), 'acetate-for-the-field-kit.bwdesign.json');
    single = await readFile(await dl1.path(), 'utf8');
    assert.equal(JSON.parse(single).recipe.target_ph, 4.75);
    a.assertClean('export');
  } finally {
    await a.close();
  }

  const b = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openPage(b);
    assert.deepEqual(await rowNames(page), []);
    await page.setInputFiles(tid('import-file'), {
      name: 'designs.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(exported),
    });
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    assert.match(await messages(page), /Imported 2 designs/);
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-all'))]);
    assert.equal(await readFile(await dl.path(), 'utf8'), exported, 're-export is byte-identical');

    // The same file again adds nothing.
    await page.setInputFiles(tid('import-file'), {
      name: 'designs.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(exported),
    });
    await page.waitForFunction(() => /already saved/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    assert.equal((await rowNames(page)).length, 2);
    await screenshot(page, 'designs-imported-tablet');
    b.assertClean('import');
  } finally {
    await b.close();
  }

  const c = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(c);
    await page.setInputFiles(tid('import-file'), {
      name: 'acetate-for-the-field-kit.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(single),
    });
    await page.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 1);
    assert.deepEqual(await rowNames(page), ['Acetate for the field kit']);
    c.assertClean('single import');
  } finally {
    await c.close();
  }
});

test('a bad import file is refused with the reason and changes nothing', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openPage(s);
    await saveDesign(page, 'Untouched', 7.0);
    const before = await storageSnapshot(page);
    const phBefore = await page.inputValue(PH);

    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    const good = JSON.parse(await readFile(await dl.path(), 'utf8'));
    const bad = { ...good, recipe: { ...good.recipe, target_ph: 15 } };
    await page.setInputFiles(tid('import-file'), {
      name: 'bad.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify({ format: 'bufferwright-designs', schema: 1, designs: [good, bad] })),
    });
    await page.waitForFunction(() => /not imported/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    const msg = await messages(page);
    assert.match(msg, /design 2 of 2/);
    assert.match(msg, /the Recipe, target pH/);
    assert.match(msg, /Nothing was changed/);

    await page.setInputFiles(tid('import-file'), {
      name: 'notes.txt',
      mimeType: 'text/plain',
      buffer: Buffer.from('pH 7.4, 50 mM'),
    });
    await page.waitForFunction(() => /“notes\.txt” was not imported: the file is not JSON/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    await screenshot(page, 'designs-bad-import');

    assert.deepEqual(await storageSnapshot(page), before);
    assert.equal(await page.inputValue(PH), phBefore);
    assert.deepEqual(await rowNames(page), ['Untouched']);
    s.assertClean('bad import');
  } finally {
    await s.close();
  }
});

test('two tabs: a save shows up in the other, and a stale save asks instead of overwriting', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const a = await openPage(s);
    const b = await openPage(s);
    await saveDesign(a, 'Shared bench buffer', 7.0);
    await b.waitForFunction(() => document.body.innerText.includes('Shared bench buffer'));

    // Both open it; A changes and saves; B (no edits) follows.
    await (await rowByName(b, 'Shared bench buffer')).locator(tid('open-design')).click();
    await a.fill(PH, '7.3');
    await a.click(tid('save-design'));
    await b.waitForFunction((sel) => document.querySelector(sel).value === '7.3', PH);
    assert.match(await messages(b), /saved in another tab/);

    // Now both edit; A saves first; B's save must not overwrite silently.
    await b.fill(PH, '6.6');
    await a.fill(PH, '7.5');
    await a.click(tid('save-design'));
    await b.waitForFunction(() => /saved in another tab/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    await b.click(tid('save-design'));
    await b.waitForSelector(tid('conflict-copy'));
    await screenshot(b, 'designs-conflict');
    const ids = JSON.parse(await b.evaluate(() => localStorage.getItem('bufferwright.index'))).ids;
    const stored = JSON.parse(await b.evaluate((id) => localStorage.getItem(`bufferwright.design.${id}`), ids[0]));
    assert.equal(stored.recipe.target_ph, 7.5, "A's save is intact");
    await b.click(tid('conflict-copy'));
    await b.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    assert.deepEqual((await rowNames(b)).sort(), ['Shared bench buffer', 'Shared bench buffer (copy)']);
    await a.waitForFunction(() => document.querySelectorAll('tr[data-testid^="design-row-"]').length === 2);
    s.assertClean('two tabs');
  } finally {
    await s.close();
  }
});

test('storage that cannot be used: a clear message, the design stays, export still works', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    await s.context.addInitScript(() => {
      Object.defineProperty(window, 'localStorage', {
        configurable: true,
        get() {
          throw new DOMException('The user denied permission to access the database.', 'SecurityError');
        },
      });
    });
    const page = await openPage(s);
    assert.match(await messages(page), /Browser storage is not available here/);
    assert.equal(await page.inputValue(PH), '7.4');
    assert.equal(await page.isDisabled(tid('export-all')), true);
    await page.fill(PH, '7.0');
    await page.click(tid('save-design'));
    assert.match(await messages(page), /not available/);
    assert.equal(await page.inputValue(PH), '7.0');
    const [dl] = await Promise.all([page.waitForEvent('download'), page.click(tid('export-design'))]);
    assert.equal(JSON.parse(await readFile(await dl.path(), 'utf8')).recipe.target_ph, 7);
    await screenshot(page, 'designs-no-storage');
    s.assertClean('no storage');
  } finally {
    await s.close();
  }
});
