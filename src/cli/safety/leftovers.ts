/**
 * Temporary folders of a replace interrupted by a crash or kill: `.tilth-new-<key>-<pid>-<n>` (the new output
 * being written) and `.tilth-old-<key>-<pid>-<n>` (the previous output set aside), where key is a short hash
 * of the output's name. The next run for the same output restores a missing output from them and removes the
 * rest, but only folders that are tilth's own (marker, only listed files) and whose process has ended.
 */
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, renameSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { ownership, readMarker, removeOwnFolder } from './ownership.js';

/** Short key of an output name, so temporary names stay short (a long --out name must still fit in 255 bytes). */
export function nameKey(target: string): string {
  return createHash('sha256').update(basename(target)).digest('hex').slice(0, 10);
}

let counter = 0;

/** A fresh temporary path beside `target` for the new output or the set-aside old one. */
export function tempPath(target: string, kind: 'new' | 'old'): string {
  return join(
    dirname(target),
    `.tilth-${kind}-${nameKey(target)}-${process.pid}-${Date.now().toString(36)}${counter++}`,
  );
}

function alive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Finds leftovers of earlier interrupted runs for `target`; restores a missing output from a complete one
 * (newest complete new output first, else the old one set aside) and removes the others. A leftover that is not
 * provably tilth's is left alone and reported.
 * @returns messages for the user (one per action), empty when there was nothing
 * @example recoverLeftovers('/fields/rx') // ['restored /fields/rx from an interrupted replace ...']
 */
export function recoverLeftovers(target: string): string[] {
  const parent = dirname(target);
  const re = new RegExp(`^\\.tilth-(new|old)-${nameKey(target)}-(\\d+)-`);
  // earlier versions of tilth: .<name>.tmp-<pid>-<time> (new) and .<name>.tmp-<pid>-<time>.old
  const legacy = new RegExp(`^\\.${escapeRe(basename(target))}\\.tmp-(\\d+)-\\d+(\\.old)?$`);
  let names: string[];
  try {
    names = readdirSync(parent);
  } catch {
    return [];
  }
  const found: { path: string; kind: 'new' | 'old' }[] = [];
  for (const n of names) {
    const m = re.exec(n);
    if (m && !alive(Number(m[2]))) found.push({ path: join(parent, n), kind: m[1] as 'new' | 'old' });
    const l = legacy.exec(n);
    if (l && !alive(Number(l[1]))) found.push({ path: join(parent, n), kind: l[2] ? 'old' : 'new' });
  }
  const notes: string[] = [];
  const mine = found.filter((f) => {
    const ok = ownership(f.path).ours;
    if (!ok)
      notes.push(
        `left alone ${f.path}: it looks like an interrupted tilth output but holds files tilth did not write; look at it and remove it yourself`,
      );
    return ok;
  });
  if (!existsSync(target)) {
    const complete =
      mine.find((f) => f.kind === 'new' && readMarker(f.path)?.state === 'complete') ??
      mine.find((f) => f.kind === 'old');
    if (complete) {
      renameSync(complete.path, target);
      notes.push(
        `restored ${target} from ${complete.kind === 'new' ? 'the complete new output' : 'the previous output'} of an interrupted replace`,
      );
      mine.splice(mine.indexOf(complete), 1);
    }
  }
  for (const f of mine) {
    try {
      removeOwnFolder(f.path);
      notes.push(`removed ${f.path}, left by an interrupted tilth run`);
    } catch {
      notes.push(`could not remove ${f.path}, left by an interrupted tilth run; remove it yourself`);
    }
  }
  return notes;
}

function escapeRe(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}
