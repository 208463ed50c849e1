/** The CLI's standard streams: a reader that goes away ends the command quietly (no EPIPE stack). */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../../helpers/cli.js';

describe('a closed stdout ends the command quietly', () => {
  it('tilth tables | (reader closes at once): no stack, no EPIPE message', () => {
    // the shell's `true` exits without reading; tilth keeps writing into the closed pipe
    const r = spawnSync(
      'bash',
      ['-c', `node ${join(ROOT, 'bin', 'tilth.js')} tables --json | true; echo "rc=\${PIPESTATUS[0]}"`],
      { encoding: 'utf8', timeout: 120_000 },
    );
    expect(r.stderr).not.toMatch(/EPIPE|internal error|at /);
    expect(r.stdout).toMatch(/rc=0/);
  });
});
