// Integrity journeys, typed the way people type: an amount is right or refused with a reason next
// to the field, never silently different. Each test is named after what it protects.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { serveDist, openSession, waitForApp, screenshot, ROOT, tid, openApp } from './harness.mjs';

/** The demo design document, from the command-line entry (the same solver crate as the page). */
function demoDoc() {
  const out = execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', '--demo'], {
    cwd: ROOT,
    encoding: 'utf8',
  });
  return JSON.parse(out);
}
/** A link in the first format: `#d=` and the base64url of the compact JSON, no check. */
const legacyLink = (doc) => `#d=${Buffer.from(JSON.stringify(doc), 'utf8').toString('base64url')}`;

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});


/** Select all the text of a field and type into it key by key, as a person does. */
async function retype(page, sel, keys) {
  await page.click(sel, { clickCount: 3 });
  await page.keyboard.press('Control+A');
  for (const k of keys) {
    if (k === 'Backspace' || k === 'Tab' || k === 'Enter') await page.keyboard.press(k);
    else await page.keyboard.type(k);
  }
}

async function amounts(page) {
  return page.$$eval('[data-testid^="recipe-ingredient-"][data-testid$="-amount"]', (els) =>
    els.map((e) => e.textContent.trim()),
  );
}

async function forms(page) {
  return page.evaluate(() => [
    document.querySelector('#recipe-acid-form')?.value,
    document.querySelector('#recipe-base-form')?.value,
  ]);
}

test('a thousands comma is never read as a decimal: "1,000" mL is refused with both readings', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openApp(s, srv.url('/'));
    await retype(page, '#recipe-volume', ['1,000']);
    const msg = await page.textContent(tid('error-recipe-volume'));
    assert.match(msg, /1000/);
    assert.match(msg, /1\.0/);
    assert.equal(await page.$(tid('recipe-ingredient-0-amount')), null, 'no amounts while the volume is refused');
    // Unambiguous decimal commas keep working.
    await retype(page, '#recipe-ph', ['7,4']);
    await retype(page, '#recipe-volume', ['1000']);
    await page.waitForSelector(tid('recipe-ingredient-0-amount'));
    assert.match(await page.textContent(tid('recipe-headline')), /1000(\.0)? mL|1(\.0)? L/);
    // Once a decimal comma was used, "1.000" is as ambiguous as "1,000".
    await retype(page, '#recipe-volume', ['1.000']);
    assert.match(await page.textContent(tid('error-recipe-volume')), /1000/);
    await screenshot(page, 'integrity-thousands-comma-tablet');
    s.assertClean('thousands comma');
  } finally {
    await s.close();
  }
});

test('a unit picker always converts the quantity, typed or not, and odd amounts ask to check the unit', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    const unit = 'select[aria-label="Final volume: unit"]';
    // Untouched: 500 mL -> 0.5 L.
    await page.selectOption(unit, { label: 'L' });
    assert.equal(await page.inputValue('#recipe-volume'), '0.5');
    assert.match(await page.textContent(tid('recipe-headline')), /500(\.0)? mL/);
    await page.selectOption(unit, { label: 'mL' });
    // Typed: 250 mL -> 0.25 L, the same amount.
    await retype(page, '#recipe-volume', ['250']);
    const before = await amounts(page);
    await page.selectOption(unit, { label: 'L' });
    assert.equal(await page.inputValue('#recipe-volume'), '0.25');
    assert.match(await page.textContent(tid('recipe-headline')), /250(\.0)? mL/);
    assert.deepEqual(await amounts(page), before, 'picking a unit never changes the amounts');
    assert.equal(await page.$(tid('recipe-unit-check')), null);
    // 250 L is typed on purpose: the page says to check the unit.
    await retype(page, '#recipe-volume', ['250']);
    await page.waitForSelector(tid('recipe-unit-check'));
    assert.match(await page.textContent(tid('recipe-unit-check')), /Check the unit/);
    await screenshot(page, 'integrity-unit-check-desktop');
    s.assertClean('unit picker');
  } finally {
    await s.close();
  }
});

test('hand-chosen reagent forms never change on a passing keystroke; a real move says so with undo', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openApp(s, srv.url('/'));
    const formsBefore = await forms(page);
    const amountsBefore = await amounts(page);
    assert.equal(formsBefore.length, 2);
    await retype(page, '#recipe-ph', ['1', 'Backspace', '7.4']);
    await page.waitForSelector(tid('recipe-ingredient-0-amount'));
    assert.deepEqual(await forms(page), formsBefore, 'forms as chosen');
    assert.deepEqual(await amounts(page), amountsBefore, 'amounts as before');
    await page.keyboard.press('Tab');
    assert.deepEqual(await forms(page), formsBefore, 'leaving the field at the same pK changes nothing');
    assert.equal(await page.$(tid('recipe-forms-notice')), null);
    // A target at another pK: the forms move only when the user is done, with a notice and undo.
    await retype(page, '#recipe-ph', ['11.8']);
    assert.deepEqual(await forms(page), formsBefore, 'not while typing');
    await page.keyboard.press('Tab');
    await page.waitForSelector(tid('recipe-forms-notice'));
    const moved = await forms(page);
    assert.notDeepEqual(moved, formsBefore);
    assert.ok(moved.includes('na2hpo4_7h2o'), `the user's heptahydrate is kept where it still serves: ${moved}`);
    await screenshot(page, 'integrity-forms-notice-tablet');
    await page.click(tid('recipe-forms-undo'));
    assert.deepEqual(await forms(page), formsBefore, 'undo brings the forms back');
    s.assertClean('forms');
  } finally {
    await s.close();
  }
});

test('an edited share link is refused with the reason; an older unchecked link opens with a notice', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    const link = await page.inputValue(tid('share-link'));
    assert.match(link, /#z=[A-Za-z0-9_-]+\.[0-9a-f]{8}$/);
    const i = link.indexOf('#z=') + 20;
    const edited = link.slice(0, i) + (link[i] === 'A' ? 'B' : 'A') + link.slice(i + 1);
    const bad = await openApp(s, edited);
    assert.match(await bad.textContent(tid('storage-message')), /does not match its check|could not be opened/);
    assert.equal(await bad.inputValue('#recipe-conc'), '50', 'the edited amounts are not shown');
    // A link of the first format (no check) still opens, and says it could not be checked.
    const doc = demoDoc();
    doc.name = 'Older link';
    const old = await openApp(s, srv.url('/') + legacyLink(doc));
    assert.match(await old.textContent(tid('design-name')), /Older link/);
    assert.match(await old.textContent(tid('storage-message')), /older link cannot be checked/);
    s.assertClean('edited link');
  } finally {
    await s.close();
  }
});

test('a misspelt key in a link or a design file is refused by name, never read as the default', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    // A preparation temperature under a misspelt key would silently become the working
    // temperature (a different meter reading): the link is refused, naming the key.
    const doc = demoDoc();
    doc.name = 'Typo link';
    doc.recipe.prepare_temprature_c = 22;
    const page = await openApp(s, srv.url('/') + legacyLink(doc));
    assert.match(await page.textContent(tid('storage-message')), /could not be opened: .*the Recipe, prepare_temprature_c.*unknown field/);
    assert.doesNotMatch(await page.textContent(tid('design-name')), /Typo link/);
    // The same document as a file: refused whole, nothing imported.
    await page.setInputFiles(tid('import-file'), {
      name: 'typo.bwdesign.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify(doc)),
    });
    await page.waitForFunction(() => /typo\.bwdesign\.json” was not imported/.test(document.querySelector('[data-testid="storage-message"]').textContent));
    assert.match(await page.textContent(tid('storage-message')), /the Recipe, prepare_temprature_c/);
    assert.equal(await page.$$eval('tr[data-testid^="design-row-"]', (r) => r.length), 0);
    s.assertClean('unknown keys');
  } finally {
    await s.close();
  }
});

test('typed text survives a tab switch and a marked field blocks saving', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openApp(s, srv.url('/'));
    await retype(page, '#recipe-volume', ['1 000']);
    assert.ok(await page.textContent(tid('error-recipe-volume')));
    await page.click(tid('tab-field'));
    await page.click(tid('tab-recipe'));
    assert.equal(await page.inputValue('#recipe-volume'), '1 000', 'what the user typed stays on screen');
    assert.ok(await page.textContent(tid('error-recipe-volume')), 'and stays marked');
    assert.ok(await page.$(tid('recipe-stale')), 'no amounts from the old value');
    await retype(page, '#recipe-ph', ['7.4.1']);
    await page.click(tid("save-design"));
    await page.waitForFunction(() => /not saved/i.test(document.querySelector('[data-testid="storage-message"]')?.textContent || ''));
    const saved = await page.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('bufferwright.design.')));
    assert.deepEqual(saved, [], 'nothing was saved');
    await screenshot(page, 'integrity-save-refused-tablet');
    s.assertClean('save refused');
  } finally {
    await s.close();
  }
});

test('the offline layer answers only the app page: other pages in the folder go to the network', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/'));
    await page.evaluate(async () => {
      const reg = await navigator.serviceWorker.ready;
      return !!reg.active;
    });
    await page.reload();
    await waitForApp(page);
    assert.ok(await page.evaluate(() => !!navigator.serviceWorker.controller), 'the worker controls the page');
    const resp = await page.goto(srv.url('/embed-example.html'));
    assert.equal(resp.status(), 200);
    assert.equal(await page.$('#app-root'), null, 'the sample page is itself, not the app');
    // A page outside the app asks the server for /favicon.ico, which this folder does not have.
    s.failedRequests.length = 0;
    s.consoleErrors.length = 0;
    // The browser asks for /favicon.ico after a page outside the app has loaded, and may log its
    // 404 late: wait for it to settle (if it comes) so it does not land in the app's start-up.
    const favicon = page.waitForResponse((r) => r.url().endsWith('/favicon.ico'), { timeout: 3000 }).catch(() => null);
    const missing = await page.goto(srv.url('/does-not-exist.html'));
    assert.equal(missing.status(), 404, 'a missing page is missing, not the app');
    if (await favicon) await page.waitForTimeout(300);
    // The 404 above is the point of this test: the browser logs it as a failed resource.
    s.failedRequests.length = 0;
    s.consoleErrors.length = 0;
    const app = await page.goto(srv.url('/index.html?ws=field#x'));
    assert.equal(app.status(), 200);
    await waitForApp(page);
    // Pages outside the app make the browser ask for /favicon.ico, which this folder lacks;
    // that 404 (and its console line) is the browser's, not the app's.
    const notFavicon = (t) => !t.includes('/favicon.ico');
    s.failedRequests.splice(0, s.failedRequests.length, ...s.failedRequests.filter(notFavicon));
    s.consoleErrors.splice(0, s.consoleErrors.length, ...s.consoleErrors.filter(notFavicon));
    s.assertClean('navigations');
  } finally {
    await s.close();
  }
});

test('a link carrying an absurdly small volume does not stretch the page', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await openApp(s, srv.url('/'));
    const doc = demoDoc();
    doc.recipe.volume_l = 1e-300;
    const page2 = await openApp(s, srv.url('/') + legacyLink(doc));
    await page2.waitForTimeout(200);
    const [scroll, width] = await page2.evaluate(() => [document.documentElement.scrollWidth, innerWidth]);
    assert.ok(scroll <= width, `page is ${scroll} px wide in a ${width} px window`);
    await screenshot(page2, 'integrity-tiny-volume-tablet');
    page.isClosed();
    s.assertClean('tiny volume');
  } finally {
    await s.close();
  }
});

test('the conductivity box has its own accessible name', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await openApp(s, srv.url('/?ws=field'));
    await page.click('label[for="field-ionic-conductivity"]');
    const box = page.getByLabel(/Conductivity|Specific conductance/i, { exact: false }).and(page.locator('input[type="text"]'));
    assert.equal(await box.count(), 1, 'one text box named after conductivity');
    const ids = await page.$$eval('[id]', (els) => els.map((e) => e.id));
    assert.equal(new Set(ids).size, ids.length, 'no duplicate ids');
    s.assertClean('a11y');
  } finally {
    await s.close();
  }
});
