// The static checks `npm run lint` and `npm test` run, side by side (each waits mostly on one core):
// ESLint, the Prettier check, knip (unused files, exports, dependencies), dependency-cruiser (the layer rules)
// and, with --types, the TypeScript check. ESLint, Prettier and tsc keep caches in node_modules/.cache, so a
// second run checks only what changed (a fresh clone runs them whole). Prints each check's output when it
// fails and exits 1 if any did.
// Usage: node scripts/lint.mjs [--types]
import { spawn } from 'node:child_process';
import { join } from 'node:path';

const cache = join('node_modules', '.cache');
const checks = [
  ['eslint', ['eslint', '--cache', '--cache-location', join(cache, 'eslint') + '/', '.']],
  [
    'prettier',
    [
      'prettier',
      '--check',
      '--log-level',
      'warn',
      '--cache',
      '--cache-strategy',
      'content',
      '--cache-location',
      join(cache, 'prettier', 'cache'),
      'src',
      'tests',
      'scripts',
      'bin',
      '*.{js,ts,json}',
    ],
  ],
  ['knip', ['knip']],
  ['dependency-cruiser', ['depcruise', 'src', '--config', '.dependency-cruiser.cjs']],
];
if (process.argv.includes('--types'))
  checks.push([
    'tsc',
    ['tsc', '--noEmit', '--incremental', '--tsBuildInfoFile', join(cache, 'tsc', 'tsbuildinfo')],
  ]);

const hints = { prettier: 'run npm run format', eslint: 'see the rule named on each line' };

function run([name, argv]) {
  const t0 = Date.now();
  return new Promise((done) => {
    const p = spawn('npx', ['--no-install', ...argv], { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    p.stdout.on('data', (d) => (out += d));
    p.stderr.on('data', (d) => (out += d));
    p.on('close', (code) => done({ name, code, out, s: (Date.now() - t0) / 1000 }));
  });
}

const results = await Promise.all(checks.map(run));
let failed = 0;
for (const r of results) {
  if (r.code === 0) {
    console.log(`${r.name}: ok (${r.s.toFixed(1)} s)`);
    continue;
  }
  failed++;
  process.stdout.write(r.out);
  console.error(`${r.name}: FAILED${hints[r.name] ? ` (${hints[r.name]})` : ''}`);
}
process.exit(failed ? 1 : 0);
