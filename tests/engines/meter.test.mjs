//! Cross-engine: the meter bench typed as people type (a comma decimal read, "1,000" refused
//! with both readings beside the field), its slope, offset and sample pH equal to the command
//! line's `calibrate`, and a removed row that leaves the others their own readings.
//! The readings are invented (a synthetic electrode), not a real meter's.
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { journey, tid, text, textOf, value, retype, waitFor, assertClean, screenshot, ROOT } from './kit.mjs';

const calibrate = (args) =>
  JSON.parse(
    execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', 'calibrate', ...args, '--json'], {
      cwd: ROOT,
      encoding: 'utf8',
    }),
  );

const rowIds = (page) =>
  page.evaluate(() =>
    [...document.querySelectorAll('[data-testid^="meter-row-"]')].map((e) => e.getAttribute('data-testid').slice('meter-row-'.length)),
  );

journey('the meter bench typed as people type equals `bufferwright calibrate`', async ({ serve, open, engine, t }) => {
  const cli = calibrate(['--temp', '25', '--point', 'phosphate_1_1=4.2', '--point', 'phthalate=168.9', '--point', 'borax=-130.4', '--sample-mv', '55']);
  const srv = await serve();
  const page = await open(srv.url('/?ws=meter'), { width: 768, height: 1024 });
  await textOf(page, tid('meter-standards'));
  const [a, b] = await rowIds(page);
  assert.ok(a && b, 'two calibration rows to start with');
  await retype(page, `#meter-pt-${a}-mv`, '4,2', 'Tab');
  await retype(page, `#meter-pt-${b}-mv`, '168.9', 'Tab');
  await page.click(tid('meter-add'));
  await waitFor(page, () => document.querySelectorAll('[data-testid^="meter-row-"]').length === 3, [], { what: 'a third row' });
  const c = (await rowIds(page))[2];
  assert.equal(await value(page, `#meter-pt-${c}-std`), 'borax');
  await retype(page, `#meter-pt-${c}-mv`, '-130,4', 'Tab');
  await retype(page, '#meter-sample-mv', '55', 'Tab');

  const percent = `${cli.slope_percent.toFixed(1)} %`;
  await waitFor(page, (s, p) => document.querySelector(s)?.textContent === p, [tid('meter-percent'), percent], { what: percent });
  assert.ok((await text(page, tid('meter-offset'))).includes(Math.abs(cli.mv_at_ph7).toFixed(1)));
  assert.equal(await text(page, tid('meter-sample-ph')), `pH ${cli.sample.ph.toFixed(2)}`);

  // "1,000" could be a thousand or one: refused beside the field with both readings, no fit shown.
  // WebKitWebDriver now and then drops key actions sent right after the fit re-renders (seen
  // once in CI: no message after 60 s); the field's own value says whether the keys arrived,
  // and a retype is reported, never silent.
  for (let i = 0; ; i++) {
    await retype(page, `#meter-pt-${b}-mv`, '1,000', 'Tab');
    const got = await value(page, `#meter-pt-${b}-mv`);
    if (got === '1,000') break;
    t.diagnostic(`${engine}: the field held "${got}" after typing "1,000"; typed again`);
    assert.ok(i < 2, `the keys never arrived: the field holds "${got}"`);
  }
  const msg = await textOf(page, tid(`error-meter-pt-${b}-mv`));
  assert.match(msg, /1000/, msg);
  assert.match(msg, /1\.0/, msg);
  await waitFor(page, (s) => !document.querySelector(s), [tid('meter-percent')], { what: 'the fit withdrawn' });
  await retype(page, `#meter-pt-${b}-mv`, '168.9', 'Tab');
  await waitFor(page, (s, p) => document.querySelector(s)?.textContent === p, [tid('meter-percent'), percent], { what: 'the fit back' });

  // Removing the first row leaves the others their own readings (rows keyed by identity).
  await page.click(tid(`meter-remove-${a}`));
  await waitFor(page, (id) => !document.querySelector(`[data-testid="meter-row-${id}"]`), [a], { what: 'row removed' });
  assert.deepEqual(await rowIds(page), [b, c]);
  assert.equal(await value(page, `#meter-pt-${b}-mv`), '168.9');
  assert.match(await value(page, `#meter-pt-${c}-mv`), /^-130[.,]4$/);
  await screenshot(page, 'meter');
  await assertClean(page, 'meter');
});
