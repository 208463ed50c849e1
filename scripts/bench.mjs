// `npm run bench`: runs every scripts/bench-*.mjs and scripts/bench-*.ts in turn (each a separate benchmark
// that prints its own table; .ts through tsx). Pass a name to run one: `npm run bench -- surface`; later
// arguments go to that script. Figures go into docs/performance.md by hand.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv[2];
const scripts = readdirSync(here).filter((f) => /^bench-.+\.(mjs|ts)$/.test(f) && (!only || f.replace(/\.(mjs|ts)$/, '') === `bench-${only}`)).sort();
if (!scripts.length) {
  console.error(`no benchmark ${only ? `"bench-${only}.mjs" ` : ''}in ${here}`);
  process.exit(1);
}
let failed = 0;
for (const s of scripts) {
  console.log(`\n== ${s} ==`);
  const pre = s.endsWith('.ts') ? ['--import', 'tsx'] : [];
  const r = spawnSync(process.execPath, [...pre, join(here, s), ...process.argv.slice(3)], { stdio: 'inherit', cwd: join(here, '..') });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
