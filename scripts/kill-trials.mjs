// Kill trials: start `tilth build` of the demo quarter into an output folder that already holds a complete
// earlier output, kill it with SIGKILL after a seeded random delay, and check what is left: the output folder
// must hold a complete old or new output, or (killed between the two renames) a complete output must lie beside
// it under its temporary name (marker state `complete`); and the next run must clean up every
// temporary folder. Usage: node scripts/kill-trials.mjs [--trials N] [--seed S]
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { numberArg, QUARTER_INPUTS, root } from './bench-lib.mjs';

const trials = numberArg('--trials', 10);
let seed = numberArg('--seed', 20261203) >>> 0;
const rnd = () => ((seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0), seed / 2 ** 32);
const args = (out) => [
  join(root, 'bin', 'tilth.js'),
  'build',
  ...QUARTER_INPUTS,
  ...['--out', out, '--force', '--threads', '1'],
];
const dir = mkdtempSync(join(tmpdir(), 'tilth-kill-'));
const out = join(dir, 'rx');
const first = spawnSync('node', args(out), { encoding: 'utf8' });
if (first.status !== 0) throw new Error(`first build failed: ${first.stderr}`);
const t0 = Date.now();
spawnSync('node', args(out));
const buildMs = Date.now() - t0;
const complete = () => existsSync(join(out, 'summary.json')) && existsSync(join(out, 'prescription.geojson'));
// a complete output set aside under its temporary name (killed between the two renames)
const completeAside = (n) => {
  try {
    return JSON.parse(readFileSync(join(dir, n, '.tilth-output.json'), 'utf8')).state === 'complete';
  } catch {
    return false;
  }
};
const leftovers = () => readdirSync(dir).filter((n) => n !== 'rx');
const tally = {
  trials: 0,
  completeAfterKill: 0,
  asideAfterKill: 0,
  lostAfterKill: 0,
  leftoversAfterKill: 0,
  cleanAfterRerun: 0,
};
for (let t = 0; t < trials; t++) {
  // most of a build is computing; the writing and the renames come in its last part, so aim there
  const delay = Math.floor(buildMs * (0.6 + 0.5 * rnd()));
  const child = spawn('node', args(out), { stdio: 'ignore' });
  const exited = new Promise((r) => child.on('exit', r));
  await new Promise((r) => setTimeout(r, delay));
  child.kill('SIGKILL');
  await exited;
  tally.trials++;
  if (complete()) tally.completeAfterKill++;
  else if (leftovers().some(completeAside)) tally.asideAfterKill++;
  else tally.lostAfterKill++;
  if (leftovers().length) tally.leftoversAfterKill++;
  const again = spawnSync('node', args(out), { encoding: 'utf8' });
  if (again.status === 0 && complete() && leftovers().length === 0) tally.cleanAfterRerun++;
  else console.error(`trial ${t} (kill after ${delay} ms): rerun exit ${again.status}, left ${leftovers()}`);
}
JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
rmSync(dir, { recursive: true, force: true });
console.log(JSON.stringify({ buildMs, ...tally }));
process.exit(tally.lostAfterKill || tally.cleanAfterRerun !== tally.trials ? 1 : 0);
