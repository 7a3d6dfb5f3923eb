//! The command-line entry (the same solver crate as the page, run natively) as the oracle the
//! cross-engine journeys compare the page with: every engine must show what it computes.
import { execFileSync, spawnSync } from 'node:child_process';
import { ROOT } from '../e2e/harness.mjs';

const run = (args, input) =>
  execFileSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    input,
    maxBuffer: 64 * 1024 * 1024,
  });

/** The demo design document (what a first visit shows). */
export const demoDoc = () => JSON.parse(run(['--demo']));
/** The full report for a design document. */
export const report = (doc) => JSON.parse(run(['-'], JSON.stringify(doc)));
/** The `log` subcommand's CSV for a file (it exits non-zero when a row has errors). */
export const logCsv = (args, file) =>
  spawnSync('cargo', ['run', '-q', '-p', 'solver', '--bin', 'bufferwright', '--', 'log', ...args, file], {
    cwd: ROOT,
    encoding: 'utf8',
  }).stdout;

/** A number as the page shows it: "7.40", "−0.12", "12,3 %", "733.5 mg". */
export const num = (t) => Number(String(t).replace('−', '-').replace(',', '.').replace(/[^0-9.eE+-]/g, ''));

/** "733.5 mg" → grams or millilitres, with its kind. */
export function amount(text) {
  const m = String(text).trim().replace(/\u2009|\u00a0/g, ' ').match(/^([0-9.,]+)\s*(g|mg|µg|mL|µL|L)$/);
  if (!m) throw new Error(`not an amount: "${text}"`);
  const scale = { g: 1, mg: 1e-3, 'µg': 1e-6, mL: 1, 'µL': 1e-3, L: 1e3 }[m[2]];
  return { value: Number(m[1].replace(',', '.')) * scale, kind: ['g', 'mg', 'µg'].includes(m[2]) ? 'g' : 'mL' };
}
