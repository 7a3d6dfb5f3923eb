// CO₂ atmosphere journeys: an incubator medium in the flask and the recipe, a pond sample in
// the air, each number equal to the command line's; bad gas input marked beside its field.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { serveDist, openSession, waitForApp, screenshot, ROOT, tid } from './harness.mjs';

const b64url = (s) => Buffer.from(s, 'utf8').toString('base64url');
const DOC = readFileSync(join(ROOT, 'solver', 'examples', 'incubator.json'), 'utf8');
const report = JSON.parse(
  execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', '-'], {
    cwd: ROOT,
    encoding: 'utf8',
    input: DOC,
  }),
);

let srv;
before(async () => {
  srv = await serveDist();
});
after(async () => {
  await srv?.close();
});

async function open(s, ws, doc = JSON.parse(DOC)) {
  const page = await s.newPage();
  await page.goto(srv.url(`/?ws=${ws}#d=${b64url(JSON.stringify(doc))}`));
  await waitForApp(page);
  return page;
}

const num = (t) => Number(t.replace('−', '-').match(/-?\d+(\.\d+)?/)[0]);

test('the flask under 5 % CO₂: pH, room air and the plot as the command line', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'desktop' });
  try {
    const page = await open(s, 'mixture');
    await page.waitForSelector(tid('mixture-ph'));
    const ph = report.mixture.Ok.equilibrium.ph;
    assert.equal(await page.textContent(tid('mixture-ph')), ph.toFixed(2));
    assert.equal(await page.inputValue('#mixture-co2-value'), '5');
    const room = report.gas.mixture.what_if.Ok.room_air_ph;
    const shown = await page.textContent(tid('mixture-gas-room-result'));
    assert.ok(shown.startsWith(`pH ${room.toFixed(2)}`), shown);
    const other = report.gas.mixture.what_if.Ok.other_ph;
    assert.ok((await page.textContent(tid('mixture-gas-other-result'))).startsWith(`pH ${other.toFixed(2)}`));
    await page.waitForSelector(`${tid('mixture-co2-plot')}[data-draw-count]`);
    await screenshot(page, 'co2-flask');
    // Room air of the user's own: 2000 µatm lowers the room-air pH.
    await page.fill('#gas-mixture-room', '2000');
    await page.waitForFunction(
      ([id, before]) => !document.querySelector(`[data-testid="${id}"]`).textContent.startsWith(before),
      [ 'mixture-gas-room-result', `pH ${room.toFixed(2)}` ],
    );
    assert.ok(num(await page.textContent(tid('mixture-gas-room-result'))) < room);
    // A percentage above 100 is refused beside the field, and the answer waits.
    await page.fill('#mixture-co2-value', '120');
    await page.waitForSelector(tid('error-mixture-co2-value'));
    assert.match(await page.textContent(tid('error-mixture-co2-value')), /0 and 100/);
    // Closed again: no gas panel.
    await page.fill('#mixture-co2-value', '5');
    await page.click('label[for="mixture-co2-kind-closed"]');
    await page.waitForSelector(tid('mixture-gas'), { state: 'detached' });
    s.assertClean('flask under a gas');
  } finally {
    await s.close();
  }
});

test('the recipe for 5 % CO₂: the NaHCO₃ to weigh, the target marked, the time not computed', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'tablet' });
  try {
    const page = await open(s, 'recipe');
    await page.waitForSelector(tid('recipe-gas-target'));
    const r = report.recipe.Ok;
    const grams = r.ingredients[0].grams;
    const body = await page.textContent('#app-root');
    assert.ok(body.includes(`${grams.toFixed(3)} g`), `${grams}`);
    assert.ok(body.includes('only after it has equilibrated') && body.includes('not computed'));
    assert.match(await page.textContent(tid('recipe-gas-target')), /5\.00 % CO₂/);
    await page.waitForSelector(`${tid('recipe-co2-plot')}[data-draw-count]`);
    await screenshot(page, 'co2-recipe-tablet');
    s.assertClean('gas recipe');
  } finally {
    await s.close();
  }
});

test('a pond sample with the air, and a gas over a flask with no carbonate refused', async () => {
  const s = await openSession({ allowedOrigin: srv.origin, view: 'phone' });
  try {
    const page = await open(s, 'field');
    await page.waitForSelector(tid('field-gas-result'));
    const g = report.gas.field.Ok;
    const txt = await page.textContent(tid('field-gas-result'));
    assert.ok(txt.includes(`pH ${g.equilibrium_ph.toFixed(2)}`) && txt.includes('lose'), txt);
    await screenshot(page, 'co2-field-phone');
    // The demo flask (Tris and NaCl) given a CO₂ atmosphere: nothing added, the reason shown.
    const demo = JSON.parse(execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', '--demo'], { cwd: ROOT, encoding: 'utf8' }));
    const flask = await open(s, 'mixture', demo);
    await flask.click('label[for="mixture-co2-kind-percent"]');
    await flask.waitForSelector(tid('error-mixture-co2'));
    assert.match(await flask.textContent(tid('error-mixture-co2')), /changes nothing/);
    assert.equal(await flask.$(tid('mixture-gas')), null);
    s.assertClean('field with air');
  } finally {
    await s.close();
  }
});
