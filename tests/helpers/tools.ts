/**
 * Outside programs used as references in tests (GDAL, R/gstat, Chromium).
 * When one is missing the test is skipped with a printed reason; with TILTH_REQUIRE_TOOLS=1
 * (set by .ci/run) a missing program is a failure instead, so CI always runs them all.
 * In the fast tier (`npm test`, TILTH_TIER=fast; see vitest.config.ts) every such test is skipped.
 */
import { spawnSync } from 'node:child_process';

const cache = new Map<string, boolean>();

/** True when `cmd args...` runs and exits 0. */
export function hasProgram(cmd: string, args: string[] = ['--version']): boolean {
  const key = [cmd, ...args].join(' ');
  if (!cache.has(key)) {
    const r = spawnSync(cmd, args, { stdio: 'ignore', timeout: 30_000 });
    cache.set(key, r.status === 0);
  }
  return cache.get(key)!;
}

/**
 * Whether a test that needs an outside program should run. Prints why it is skipped,
 * or throws when TILTH_REQUIRE_TOOLS=1 (CI) and the program is missing.
 * @example describe.skipIf(!requireTool('gdal_grid', 'Debian gdal-bin'))('matches gdal_grid', ...)
 */
export function requireTool(cmd: string, pkg: string, args: string[] = ['--version']): boolean {
  if (process.env.TILTH_TIER === 'fast') return false;
  if (hasProgram(cmd, args)) return true;
  const msg = `${cmd} is not installed (apt-get install -y ${pkg}); tests that compare with it are skipped`;
  if (process.env.TILTH_REQUIRE_TOOLS === '1')
    throw new Error(
      `TILTH_REQUIRE_TOOLS=1 but ${msg.replace('; tests that compare with it are skipped', '')}`,
    );
  console.warn(`SKIP: ${msg}`);
  return false;
}

/**
 * The standard output of an outside program; throws with its standard error when it fails.
 * @example sh('ogrinfo', ['-ro', '-al', '-so', 'rx.shp'])
 */
export function sh(cmd: string, args: string[]): string {
  const r = spawnSync(cmd, args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')}: ${r.stderr}`);
  return r.stdout;
}

/**
 * GDAL's verdict on a layer's polygons (ogrinfo, SQLite dialect): [features, features ST_IsValid calls valid].
 * @example expect(ogrValid('zones.geojson', 'zones')).toEqual([2, 2])
 */
export function ogrValid(file: string, layer: string): [number, number] {
  const out = sh('ogrinfo', [
    ...['-ro', '-q', '-dialect', 'sqlite', '-sql'],
    `SELECT COUNT(*) AS n, SUM(ST_IsValid(geometry)) AS v FROM "${layer}"`,
    file,
  ]);
  return [Number(/n \(Integer\) = (\d+)/.exec(out)?.[1]), Number(/v \(Integer\) = (\d+)/.exec(out)?.[1])];
}
