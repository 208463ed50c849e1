// Prettier check over the whole code base (src, tests, scripts, bin and the root config files); fixtures and
// sample fields are left as their sources wrote them (see .prettierignore). Exits 1 naming each file Prettier
// would change; `npm run format` fixes them.
import { execFileSync } from 'node:child_process';

try {
  execFileSync(
    'npx',
    ['prettier', '--check', '--log-level', 'warn', 'src', 'tests', 'scripts', 'bin', '*.{js,ts,json}'],
    {
      stdio: 'inherit',
    },
  );
  console.log('prettier: all files formatted');
} catch {
  console.error('prettier: files above are not formatted (run npm run format)');
  process.exit(1);
}
