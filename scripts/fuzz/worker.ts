/**
 * Fuzz worker: receives { seed } over IPC, runs the seeded target in a fresh temporary folder and answers
 * { seed, target, outcome | crash }. The parent (run.ts) kills it when a run passes the hang bound.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { isUserError } from '../../src/errors.js';
import { rng } from './rng.js';
import { targetOf } from './targets.js';

const base = mkdtempSync(join(tmpdir(), 'tilth-fuzz-'));

process.on('message', async (m: { seed: number; only?: string[] }) => {
  const t = targetOf(m.seed, m.only);
  const dir = mkdtempSync(join(base, `${m.seed}-`));
  const started = Date.now();
  let reply: Record<string, unknown>;
  try {
    const res = await t.run(rng(m.seed), dir);
    reply = { seed: m.seed, target: t.name, outcome: res.outcome, mustRefuse: res.mustRefuse };
  } catch (e) {
    if (isUserError(e))
      reply = {
        seed: m.seed,
        target: t.name,
        outcome: 'refused',
        message: (e as Error).message.slice(0, 300),
      };
    else
      reply = {
        seed: m.seed,
        target: t.name,
        outcome: 'crash',
        message: String((e as Error)?.stack ?? e)
          .split('\n')
          .slice(0, 6)
          .join('\n'),
      };
  }
  reply.ms = Date.now() - started;
  reply.rssMb = Math.round(process.memoryUsage().rss / 1048576);
  rmSync(dir, { recursive: true, force: true });
  process.send!(reply);
});
process.on('disconnect', () => {
  rmSync(base, { recursive: true, force: true });
  process.exit(0);
});
process.send!({ ready: true });
