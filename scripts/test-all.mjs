// Runs every test suite (server, client unit, browser), then prints one line with the totals.
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';

const root = new URL('..', import.meta.url).pathname;
const out = join(root, 'test-results');
mkdirSync(out, { recursive: true });

function run(label, command, args, env = {}) {
  console.log(`\n=== ${label} ===`);
  const started = Date.now();
  const result = spawnSync(command, args, {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, ...env },
  });
  console.log(
    `=== ${label}: exit ${result.status} after ${Math.round((Date.now() - started) / 1000)} s ===`,
  );
  return result.status ?? 1;
}

function vitestTotals(file) {
  if (!existsSync(file)) return null;
  const report = JSON.parse(readFileSync(file, 'utf8'));
  return { passed: report.numPassedTests ?? 0, failed: report.numFailedTests ?? 0 };
}

function playwrightTotals(file) {
  if (!existsSync(file)) return null;
  const report = JSON.parse(readFileSync(file, 'utf8'));
  const stats = report.stats ?? {};
  return { passed: stats.expected ?? 0, failed: (stats.unexpected ?? 0) + (stats.flaky ?? 0) };
}

const suites = [];
for (const file of ['server.json', 'client.json', 'browser.json'])
  rmSync(join(out, file), { force: true });

const buildStatus = run('build the web client', 'node', ['scripts/build-if-needed.mjs']);

const serverStatus = run('server tests', 'npx', [
  'vitest',
  'run',
  '--config',
  'vitest.server.config.ts',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${join(out, 'server.json')}`,
]);
suites.push(['server', serverStatus, vitestTotals(join(out, 'server.json'))]);

const clientStatus = run('client unit tests', 'npx', [
  'ng',
  'test',
  '--watch=false',
  '--reporters=json',
  '--reporters=default',
  `--output-file=${join(out, 'client.json')}`,
]);
suites.push(['client', clientStatus, vitestTotals(join(out, 'client.json'))]);

const browserStatus =
  buildStatus === 0
    ? run('browser tests', 'npx', ['playwright', 'test'], {
        PLAYWRIGHT_JSON_OUTPUT_NAME: join(out, 'browser.json'),
      })
    : 1;
suites.push(['browser', browserStatus, playwrightTotals(join(out, 'browser.json'))]);

let passed = 0;
let failed = 0;
console.log('\n=== summary ===');
for (const [name, status, totals] of suites) {
  const t = totals ?? { passed: 0, failed: 1 };
  // A suite that crashed before reporting counts as one failure, so a broken run is never green.
  if (status !== 0 && t.failed === 0) t.failed = 1;
  passed += t.passed;
  failed += t.failed;
  console.log(`${name}: ${t.passed} passed, ${t.failed} failed (exit ${status})`);
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 && buildStatus === 0 ? 0 : 1);
