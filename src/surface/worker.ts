/**
 * Entry of a surface worker thread (parallel.ts): answers per-cell jobs from the thread that started it.
 * Bundled as dist/surface-worker.mjs; from the TypeScript sources bin/tilth.js loads it through tsx.
 */
import { parentPort } from 'node:worker_threads';
import { serveSurfaceJobs } from './parallel.js';

if (parentPort) serveSurfaceJobs(parentPort);
