/**
 * One temporary folder for the whole test run: every test file's and every spawned CLI's temporary files go
 * under it (TMPDIR, which os.tmpdir() reads), and it is removed when the run ends, so no run leaves folders
 * behind in the system's temporary folder. TILTH_KEEP_TEST_FILES=1 keeps it and prints where it is.
 */
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export default function setup(): () => void {
  const dir = mkdtempSync(join(tmpdir(), 'tilth-tests-'));
  // like /tmp itself: the tests that run the CLI as another user (nobody) need to make folders here too
  chmodSync(dir, 0o1777);
  const before = process.env.TMPDIR;
  process.env.TMPDIR = dir;
  return () => {
    if (before === undefined) delete process.env.TMPDIR;
    else process.env.TMPDIR = before;
    if (process.env.TILTH_KEEP_TEST_FILES === '1') console.log(`test files kept in ${dir}`);
    else rmSync(dir, { recursive: true, force: true });
  };
}
