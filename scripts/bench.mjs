// `npm run bench`: runs every scripts/bench-*.mjs and bench-*.ts in turn (.ts through tsx) (each is a separate benchmark that prints its own
// table). Pass a name to run one: `npm run bench -- surface`; arguments after the name go to that script
// (`npm run bench -- build --quick`). TILTH_BENCH_QUICK=1 shortens the build benchmark (1 run per figure) when
// all run. Figures go into docs/performance.md by hand.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv[2];
// modules the benchmarks import, not benchmarks: the shared helpers and the section maker (which wants a folder)
const NOT_BENCHMARKS = new Set(['bench-lib.mjs', 'bench-section.mjs']);
const scripts = readdirSync(here)
  .filter(
    (f) =>
      /^bench-.+\.(mjs|ts)$/.test(f) &&
      !NOT_BENCHMARKS.has(f) &&
      (!only || f.replace(/\.(mjs|ts)$/, '') === `bench-${only}`),
  )
  .sort();
if (!scripts.length) {
  console.error(`no benchmark ${only ? `"bench-${only}.mjs" ` : ''}in ${here}`);
  process.exit(1);
}
let failed = 0;
for (const s of scripts) {
  console.log(`\n== ${s} ==`);
  const pre = s.endsWith('.ts') ? ['--import', 'tsx'] : [];
  const r = spawnSync(process.execPath, [...pre, join(here, s), ...process.argv.slice(3)], {
    stdio: 'inherit',
    cwd: join(here, '..'),
  });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
