// Builds the Angular client when dist/ is missing or older than the sources it is built from.
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';

const root = new URL('..', import.meta.url).pathname;
const dist = join(root, 'dist/maculo/browser');
const stampFile = join(root, 'dist/maculo/.source-hash');
const inputs = [
  'src',
  'shared',
  'public',
  'angular.json',
  'tsconfig.json',
  'tsconfig.app.json',
  'package-lock.json',
];

function addTree(hash, path) {
  if (!existsSync(path)) return;
  const stat = statSync(path);
  if (stat.isDirectory()) {
    for (const name of readdirSync(path).sort()) {
      if (name.endsWith('.spec.ts')) continue;
      addTree(hash, join(path, name));
    }
  } else {
    hash.update(path.slice(root.length));
    hash.update(readFileSync(path));
  }
}

const hash = createHash('sha256');
for (const input of inputs) addTree(hash, join(root, input));
const digest = hash.digest('hex');
const current = existsSync(stampFile) ? readFileSync(stampFile, 'utf8').trim() : '';

if (
  existsSync(join(dist, 'index.html')) &&
  current === digest &&
  !process.argv.includes('--force')
) {
  console.log('Client build is up to date.');
} else {
  console.log('Building the web client (about a minute on two cores)…');
  const result = spawnSync('npx', ['ng', 'build', '--configuration', 'production'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, NG_CLI_ANALYTICS: 'false' },
  });
  if (result.status !== 0) process.exit(result.status ?? 1);
  writeFileSync(stampFile, digest + '\n');
}
