// Prettier check over the files listed in .prettier-checked (the formatted part of the code base; see
// DEVELOPERS.md, "Lint"). Exits 1 naming each file Prettier would change.
import { readFileSync } from 'node:fs';
import { check, resolveConfig } from 'prettier';

const files = readFileSync('.prettier-checked', 'utf8')
  .split('\n')
  .map((l) => l.trim())
  .filter((l) => l && !l.startsWith('#'));
const bad = [];
for (const f of files) {
  const options = { ...(await resolveConfig(f)), filepath: f };
  if (!(await check(readFileSync(f, 'utf8'), options))) bad.push(f);
}
if (bad.length) {
  console.error(
    `prettier: ${bad.length} file(s) not formatted (run npx prettier --write FILE):\n  ${bad.join('\n  ')}`,
  );
  process.exit(1);
}
console.log(`prettier: ${files.length} files formatted`);
