/**
 * Which folders tilth wrote itself. Every output folder carries a marker file, `.tilth-output.json`,
 * naming the tilth version and every file written; `--force` replaces only such a folder (or an empty one,
 * or a folder of an earlier tilth recognised by its summary.json / variability.json and file names).
 */
import { lstatSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { VERSION } from '../../version.js';

/** Name of the marker file in every output folder tilth writes. */
export const MARKER = '.tilth-output.json';

/** Most entries looked at in an existing folder before it is judged not tilth's (a folder of a huge tree is not an output). */
const MAX_SCAN = 20_000;

/** Contents of the marker file. */
export interface Marker {
  tilth: string;
  /** 'writing' while files are written, 'complete' once every file is there */
  state: 'writing' | 'complete';
  created: string;
  /** every file written, relative paths with '/' */
  files: string[];
}

/** The marker's text; `files` are the relative paths to be written. */
export function markerText(files: Iterable<string>, state: Marker['state']): string {
  const m: Marker = { tilth: VERSION, state, created: new Date().toISOString(), files: [...files].sort() };
  return JSON.stringify(m, null, 1) + '\n';
}

/** The marker of a folder, or null when missing or not tilth's. */
export function readMarker(dir: string): Marker | null {
  try {
    const m = JSON.parse(readFileSync(join(dir, MARKER), 'utf8')) as Partial<Marker>;
    if (
      typeof m.tilth !== 'string' ||
      !Array.isArray(m.files) ||
      !m.files.every((f) => typeof f === 'string')
    )
      return null;
    if (m.state !== 'writing' && m.state !== 'complete') return null;
    return m as Marker;
  } catch {
    return null;
  }
}

/** Files (not folders) under `dir`, relative with '/'; symbolic links and other non-files are listed with a trailing '@'. Null when over MAX_SCAN entries. */
export function listFiles(dir: string): string[] | null {
  const out: string[] = [];
  const stack = [''];
  let seen = 0;
  while (stack.length) {
    const rel = stack.pop()!;
    for (const name of readdirSync(join(dir, rel))) {
      if (++seen > MAX_SCAN) return null;
      const r = rel ? `${rel}/${name}` : name;
      const st = lstatSync(join(dir, r));
      if (st.isDirectory()) stack.push(r);
      else out.push(st.isFile() ? r : r + '@');
    }
  }
  return out.sort();
}

/** File names an earlier tilth (without the marker) wrote in a build or variability folder. */
const LEGACY = [
  /^prescription(-[^/]+)?\.geojson$/,
  /^zones\.csv$/,
  /^summary\.json$/,
  /^report\.html$/,
  /^report-data\.json$/,
  /^shapefiles\/[^/]+\.(shp|shx|dbf|prj|cpg|zip|txt)$/,
  /^[a-z0-9_]+-(semivariogram|map)\.svg$/,
  /^variability\.json$/,
];

function legacyOwned(dir: string, files: string[]): boolean {
  const read = (f: string) => {
    try {
      return JSON.parse(readFileSync(join(dir, f), 'utf8')) as Record<string, unknown>;
    } catch {
      return null;
    }
  };
  let proof = false;
  if (files.includes('summary.json')) {
    const s = read('summary.json');
    const prov = s?.provenance as Record<string, unknown> | undefined;
    proof = typeof prov?.tilth === 'string';
  } else if (files.includes('variability.json')) {
    const v = read('variability.json');
    proof = !!v && 'semivariogram' in v;
  }
  return proof && files.every((f) => LEGACY.some((re) => re.test(f)));
}

/** What an existing folder holds, judged for replacing. */
export interface Ownership {
  /** empty, or only files tilth wrote */
  ours: boolean;
  empty: boolean;
  /** files tilth did not write (all of them when there is no marker) */
  foreign: string[];
  /** more entries than could be looked at */
  tooBig: boolean;
}

/**
 * Whether tilth may replace `dir`: empty, or holding its marker and no file the marker does not list,
 * or an earlier tilth's output (summary.json with tilth provenance and only its file names).
 * @example ownership('rx').ours // true for a folder `tilth build --out rx` wrote
 */
export function ownership(dir: string): Ownership {
  const files = listFiles(dir);
  if (files === null) return { ours: false, empty: false, foreign: [], tooBig: true };
  if (files.length === 0 && readdirSync(dir).length === 0)
    return { ours: true, empty: true, foreign: [], tooBig: false };
  const marker = readMarker(dir);
  if (marker) {
    const listed = new Set([...marker.files, MARKER]);
    const foreign = files.filter((f) => !listed.has(f));
    return { ours: foreign.length === 0, empty: false, foreign, tooBig: false };
  }
  if (legacyOwned(dir, files)) return { ours: true, empty: false, foreign: [], tooBig: false };
  return {
    ours: false,
    empty: false,
    foreign: files.length ? files : ['(empty sub-folders)'],
    tooBig: false,
  };
}

/**
 * Deletes a folder tilth wrote, its marker last, so a delete that stops half-way (permissions, a kill) leaves a
 * folder still recognisable as tilth's.
 * @example removeOwnFolder('/fields/.tilth-old-3f2a9c0d1e-4242-lq0')
 */
export function removeOwnFolder(dir: string): void {
  for (const name of readdirSync(dir))
    if (name !== MARKER) rmSync(join(dir, name), { recursive: true, force: true });
  rmSync(dir, { recursive: true, force: true });
}
