/** Provenance of a build: tilth's version, a hash per input file and one short id for all of them. */
import { createHash } from 'node:crypto';
import { VERSION } from '../version.js';
import type { Provenance } from './outputs.js';

/** A named input of a build (samples, boundary, plan, zones, tables) with its bytes. */
export interface NamedBytes {
  name: string;
  bytes: Uint8Array;
}

/**
 * The short hash printed on the report's title block, so a printed copy can be matched to its files:
 * the first 12 hex digits of SHA-256 over each input's name and bytes (samples, boundary, plan, tables ...),
 * in the order given, each length-prefixed so that moving bytes between files changes the hash.
 * @example inputsHash([{ name: 'plan.yaml', bytes: readFileSync('plan.yaml') }]) // e.g. '3f9a2c1e07b4'
 */
export function inputsHash(files: readonly NamedBytes[]): string {
  const h = createHash('sha256');
  for (const f of files) {
    const name = Buffer.from(f.name, 'utf8');
    const len = Buffer.alloc(16);
    len.writeBigUInt64BE(BigInt(name.length), 0);
    len.writeBigUInt64BE(BigInt(f.bytes.length), 8);
    h.update(len).update(name).update(f.bytes);
  }
  return h.digest('hex').slice(0, 12);
}

/**
 * The provenance written into summary.json and the report: SHA-256 of each input, the short id of all, the date.
 * @param created the build's date (default now)
 * @example provenance([{ name: 'plan', bytes }]).id
 */
export function provenance(inputs: readonly NamedBytes[], created: Date = new Date()): Provenance {
  const hash = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
  return {
    tilth: VERSION,
    created: created.toISOString(),
    inputs: Object.fromEntries(inputs.map((f) => [f.name, hash(f.bytes)])),
    id: inputsHash(inputs),
  };
}
