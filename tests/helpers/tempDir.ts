/** A temporary folder for one test file's outputs: made before its tests, removed after them. */
import { afterAll, beforeAll } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Call at the top of a test file. `path` names a place in the folder; `save` writes a set of files (a
 * shapefile set, a zip) into a sub-folder and returns that sub-folder.
 * @example const { path, save } = tempDir('tilth-shp-'); save(writeShapefile(...), 'utm')
 */
export function tempDir(prefix: string): {
  path: (...parts: string[]) => string;
  save: (files: Record<string, Uint8Array>, sub: string) => string;
} {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), prefix));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return {
    path: (...parts) => join(dir, ...parts),
    save(files, sub) {
      const d = join(dir, sub);
      mkdirSync(d, { recursive: true });
      for (const [k, v] of Object.entries(files)) writeFileSync(join(d, k), v);
      return d;
    },
  };
}
