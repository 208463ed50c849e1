/**
 * Every check of `tilth check` on its fixtures: for each tests/check/fixtures/<check>/in/<case> (a .geojson, or a
 * folder of shapefile or task data files) the check's findings must equal out/<case>.json. `REGEN=1 npx vitest
 * run tests/check/fixtures.test.ts` rewrites the out files (tests/check/fixtures/README.md); the inputs are written
 * by scripts/make-check-fixtures.ts.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkPrescription, layerFromGeoJSON, readLayer, type CheckLayer } from '../../src/check/index.js';
import { usableFeatures } from '../../src/check/coords.js';
import { layersFromTaskDataFiles } from '../../src/check/taskdata.js';
import type { CheckLine, CheckOptions } from '../../src/check/types.js';
import { isUserError } from '../../src/errors.js';
import { parseLength, parseSpeed } from '../../src/units/index.js';

const ROOT = join(import.meta.dirname, 'fixtures');
const REGEN = !!process.env.REGEN;

/** What a case found: the check's report lines, or the refusal (exit 2) when the input is unusable. */
type Findings = { status: string } & Record<string, unknown>;

/** The GeoJSON case's `options` member as CheckOptions (speed and swath as written on the command line). */
function options(o: Record<string, unknown> | undefined): CheckOptions {
  const { boundary, speed, swath, ...rest } = o ?? {};
  return {
    ...rest,
    boundary: boundary ? layerFromGeoJSON(JSON.stringify(boundary), 'boundary.geojson') : undefined,
    speed: typeof speed === 'string' ? parseSpeed(speed) : undefined,
    swath: typeof swath === 'string' ? parseLength(swath) : undefined,
  };
}

/** The worst status of the lines: fail over warn over skip over pass. */
const worst = (lines: CheckLine[]) =>
  (['fail', 'warn', 'skip', 'pass'] as const).find((s) => lines.some((l) => l.status === s)) ?? 'pass';

/** The report lines of `checks` for a layer, with their status summed up. */
function lines(
  layer: CheckLayer,
  opts: CheckOptions,
  checks: string[],
): { status: string; zones: number; lines: CheckLine[] } {
  const found = checkPrescription(layer, opts).lines.filter((l) => checks.includes(l.check));
  return { status: worst(found), zones: layer.features.length, lines: found };
}

/** A refusal's findings: what the CLI prints before exiting 2. */
async function orRefused(run: () => Findings | Promise<Findings>): Promise<Findings> {
  try {
    return await run();
  } catch (e) {
    if (!isUserError(e)) throw e;
    return { status: 'refused', message: (e as Error).message };
  }
}

const geojson = (checks: string[]) => (path: string, name: string) => {
  const text = readFileSync(path, 'utf8');
  const layer = layerFromGeoJSON(text, `${name}.geojson`);
  return lines(layer, options((JSON.parse(text) as { options?: Record<string, unknown> }).options), checks);
};

const folder = (path: string): Record<string, Uint8Array> =>
  Object.fromEntries(readdirSync(path).map((f) => [f, new Uint8Array(readFileSync(join(path, f)))]));

/** Per check (its source file in src/check/): how a case is run and its findings written. */
const RUN: Record<string, (path: string, name: string) => Findings | Promise<Findings>> = {
  crs: geojson(['crs']),
  geometry: geojson(['geometry']),
  overlap: geojson(['overlap']),
  boundary: geojson(['outside', 'gaps']),
  rates: geojson(['rate_field', 'rate_range', 'total']),
  zoneSize: geojson(['zone_size']),
  coords: (path, name) => {
    const layer = layerFromGeoJSON(readFileSync(path, 'utf8'), `${name}.geojson`);
    const problems = usableFeatures(layer.features).problems;
    return { ...lines(layer, {}, ['geometry']), problems };
  },
  setfiles: async (path) => {
    const layer = await readLayer(folder(path), 'rx.shp');
    return { status: 'pass', zones: layer.features.length, fields: layer.fields, crsSource: layer.crsSource };
  },
  taskdata: (path) => {
    const layers = layersFromTaskDataFiles(folder(path), 'TASKDATA.XML');
    const each = layers.map((l) => ({
      label: l.label,
      fields: l.fields.map((f) => f.name),
      ...lines(l, {}, ['geometry', 'overlap', 'rate_field', 'total']),
    }));
    return { status: worst(each.flatMap((l) => l.lines)), layers: each };
  },
};

describe.each(Object.keys(RUN))('check %s on its fixtures', (check) => {
  const dir = join(ROOT, check);
  const cases = readdirSync(join(dir, 'in')).map((f) => f.replace(/\.geojson$/, ''));

  it('has a passing case and a failing one', () => {
    expect(cases.some((c) => c.startsWith('pass'))).toBe(true);
    expect(cases.some((c) => c.startsWith('fail') || c.startsWith('refused'))).toBe(true);
  });

  it.each(cases)('%s', async (name) => {
    const input = join(dir, 'in', existsSync(join(dir, 'in', name)) ? name : `${name}.geojson`);
    const got = await orRefused(() => RUN[check](input, name));
    const out = join(dir, 'out', `${name}.json`);
    if (REGEN) {
      mkdirSync(join(dir, 'out'), { recursive: true });
      writeFileSync(out, JSON.stringify(got, null, 2) + '\n');
    }
    expect(got).toEqual(JSON.parse(readFileSync(out, 'utf8')));
    // the case's name says what it must find
    expect(got.status).toBe(/^(pass|warn|fail|skip|refused)/.exec(name)![1]);
  });
});
