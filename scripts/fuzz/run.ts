/**
 * Seeded mutation fuzzing of tilth's readers and commands: `npm run fuzz -- --runs N [--seed S] [--hang-ms T]
 * [--only a,b] [--workers N] [--json out.json]`. The JSON summary is rewritten every 100 runs, so a stopped run leaves its record. Each run is a seed; the same seed reruns the same case (`--seed S --runs 1`).
 * Fails (exit 1) on any crash (an error that is not a UserError), hang (a run past --hang-ms, default 30 s),
 * or an input that must be refused but was accepted. Runs in a worker process that is restarted after a hang and
 * every 250 runs (memory).
 */
import { fork, type ChildProcess } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ensureBomb, targetOf } from './targets.js';
import { ensureTaskData } from './taskdata.js';

interface Reply {
  seed: number;
  target: string;
  outcome: string;
  message?: string;
  mustRefuse?: string;
  ms: number;
  rssMb: number;
}

function args() {
  const a = process.argv.slice(2);
  const get = (k: string, d?: string) => {
    const i = a.indexOf(k);
    return i >= 0 ? a[i + 1] : d;
  };
  return {
    workers: Math.max(1, Number(get('--workers', '1'))),
    runs: Number(get('--runs', '200')),
    seed: Number(get('--seed', '1')),
    hangMs: Number(get('--hang-ms', '30000')),
    only: get('--only')?.split(','),
    json: get('--json'),
    quiet: a.includes('--quiet'),
  };
}

function startWorker(): Promise<ChildProcess> {
  const w = fork(join(import.meta.dirname, 'worker.ts'), [], {
    execArgv: ['--import', 'tsx', '--max-old-space-size=2048'],
    stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
  });
  return new Promise((res, rej) => {
    w.once('message', () => res(w));
    w.once('exit', (c) => rej(new Error(`fuzz worker exited ${c} before it was ready`)));
  });
}

/** One run in the worker, or a hang / signal when it does not answer in time. */
function runOne(w: ChildProcess, seed: number, hangMs: number, only?: string[]): Promise<Reply> {
  return new Promise((res) => {
    const timer = setTimeout(() => {
      w.kill('SIGKILL');
      res({ seed, target: targetOf(seed, only).name, outcome: 'hang', ms: hangMs, rssMb: 0 });
    }, hangMs);
    const onExit = (code: number | null, sig: string | null) => {
      clearTimeout(timer);
      res({
        seed,
        target: targetOf(seed, only).name,
        outcome: 'signal',
        message: `worker died: ${sig ?? code}`,
        ms: 0,
        rssMb: 0,
      });
    };
    w.once('exit', onExit);
    w.once('message', (m) => {
      clearTimeout(timer);
      w.off('exit', onExit);
      res(m as Reply);
    });
    w.send({ seed, only });
  });
}

type Counts = Record<string, Record<string, number>>;

function summarise(
  o: ReturnType<typeof args>,
  done: number,
  counts: Counts,
  bad: Reply[],
  t0: number,
  slowest: number,
  peakRss: number,
) {
  return {
    runs: done,
    requested: o.runs,
    firstSeed: o.seed,
    seconds: Math.round((Date.now() - t0) / 1000),
    slowestMs: slowest,
    peakRssMb: peakRss,
    byTarget: counts,
    bad: bad.map((b) => ({
      seed: b.seed,
      target: b.target,
      outcome: b.outcome,
      message: b.message?.split('\n')[0],
    })),
  };
}

/** One worker's share: seeds seed+i for i = start, start+step, ... */
async function lane(
  o: ReturnType<typeof args>,
  start: number,
  step: number,
  record: (r: Reply) => void,
): Promise<void> {
  let w = await startWorker();
  let sinceStart = 0;
  for (let i = start; i < o.runs; i += step) {
    if (sinceStart >= 250) {
      w.disconnect();
      w = await startWorker();
      sinceStart = 0;
    }
    const r = await runOne(w, o.seed + i, o.hangMs, o.only);
    sinceStart++;
    record(r);
    if (r.outcome === 'hang' || r.outcome === 'signal') {
      w = await startWorker();
      sinceStart = 0;
    }
  }
  w.disconnect();
}

async function main() {
  const o = args();
  const counts: Counts = {};
  const bad: Reply[] = [];
  if (!o.only || o.only.includes('zip-bomb')) ensureBomb();
  if (!o.only || o.only.includes('check-taskdata')) await ensureTaskData();
  let done = 0,
    slowest = 0,
    peakRss = 0;
  const t0 = Date.now();
  const record = (r: Reply) => {
    done++;
    slowest = Math.max(slowest, r.ms);
    peakRss = Math.max(peakRss, r.rssMb);
    const cls = r.outcome === 'accepted' && r.mustRefuse ? 'wrongly-accepted' : r.outcome;
    (counts[r.target] ??= {})[cls] = (counts[r.target]![cls] ?? 0) + 1;
    if (cls === 'crash' || cls === 'hang' || cls === 'signal' || cls === 'wrongly-accepted') {
      bad.push(r);
      process.stderr.write(
        `\nseed ${r.seed} ${r.target}: ${cls}${r.mustRefuse ? ` (${r.mustRefuse})` : ''}\n${r.message ?? ''}\n`,
      );
    }
    if (done % 100 === 0) {
      if (!o.quiet) process.stderr.write(`\r${done}/${o.runs} runs, ${bad.length} bad`);
      if (o.json)
        writeFileSync(
          o.json,
          JSON.stringify(summarise(o, done, counts, bad, t0, slowest, peakRss), null, 2) + '\n',
        );
    }
  };
  await Promise.all(Array.from({ length: o.workers }, (_, k) => lane(o, k, o.workers, record)));
  const summary = summarise(o, done, counts, bad, t0, slowest, peakRss);
  if (o.json) writeFileSync(o.json, JSON.stringify(summary, null, 2) + '\n');
  process.stdout.write(`\n${JSON.stringify(summary, null, 2)}\n`);
  process.exitCode = bad.length ? 1 : 0;
}

await main();
