#!/usr/bin/env node
// Launcher: runs the bundled CLI (dist/tilth.mjs, built by `npm install`)
// when it is newer than every file under src/ and tables/, otherwise the
// TypeScript sources directly through tsx. No build step to remember.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { isMainThread, workerData } from 'node:worker_threads';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const dist = join(root, 'dist', 'tilth.mjs');

if (!isMainThread && workerData?.tilthSurfaceWorker) {
  // a surface worker started by the CLI running from the sources (src/cli/threads.ts): the worker through tsx
  const { register } = await import('tsx/esm/api');
  register();
  await import(pathToFileURL(join(root, 'src', 'surface', 'worker.ts')).href);
} else if (!isMainThread && workerData?.tilthReportWorker) {
  // the report worker started by the CLI running from the sources (src/cli/sulphurAhead.ts)
  const { register } = await import('tsx/esm/api');
  register();
  await import(pathToFileURL(join(root, 'src', 'cli', 'reportWorker.ts')).href);
} else {
  await main();
}

function newest(dir) {
  let t = 0;
  if (!existsSync(dir)) return t;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

async function main() {
  const useDist =
    existsSync(dist) &&
    process.env.TILTH_FROM_SOURCE !== '1' &&
    statSync(dist).mtimeMs >= Math.max(newest(join(root, 'src')), newest(join(root, 'tables')));

  if (useDist) {
    await import(pathToFileURL(dist).href);
  } else {
    const { register } = await import('tsx/esm/api');
    register();
    await import(pathToFileURL(join(root, 'src', 'cli', 'main.ts')).href);
  }
}
