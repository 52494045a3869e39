#!/usr/bin/env node
// `npm start` / `npm run start:web`: sideloads the add-in into Excel through office-addin-debugging,
// which is an optional install (README, "Installing the add-in in Excel"). When it is absent this
// says how to get it instead of failing with "command not found".
import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import path from 'node:path';

const target = process.argv[2] === 'web' ? 'web' : 'desktop';
const require = createRequire(import.meta.url);
let bin;
try {
  const pkgFile = require.resolve('office-addin-debugging/package.json');
  const pkg = require(pkgFile);
  const rel = typeof pkg.bin === 'string' ? pkg.bin : pkg.bin['office-addin-debugging'];
  bin = path.join(path.dirname(pkgFile), rel);
} catch {
  console.error(
    'The sideload toolchain (office-addin-debugging) is not installed: it is optional because it builds a native keychain module.\n' +
      'It is needed only to sideload into Excel on Windows, macOS or the web. Install it with\n' +
      '  npm install office-addin-debugging --no-save\n' +
      '(on Linux first: apt-get install libsecret-1-dev g++ make). See README.md, "Installing the add-in in Excel".',
  );
  process.exit(1);
}
const args = [bin, 'start', 'manifest.xml', target, '--app', 'excel', '--dev-server', 'npm run dev-server', '--dev-server-port', '3000'];
const r = spawnSync(process.execPath, args, { stdio: 'inherit' });
process.exit(r.status ?? 1);
