#!/usr/bin/env node
// `npm test`: typecheck, lint, format check, client build, then every Vitest test
// (unit, API and browser). Ends with the line "N passed, N failed" that CI reads;
// each static check counts as one.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, rmSync } from 'node:fs';

const results = { passed: 0, failed: 0, skipped: 0 };
const failures = [];

function step(name, cmd, args, env = {}) {
  const started = Date.now();
  process.stdout.write(`\n== ${name}: ${cmd} ${args.join(' ')}\n`);
  const run = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } });
  const ok = run.status === 0;
  process.stdout.write(
    `== ${name}: ${ok ? 'ok' : 'FAILED'} (${((Date.now() - started) / 1000).toFixed(1)} s)\n`,
  );
  return ok;
}

function check(name, cmd, args) {
  if (step(name, cmd, args)) results.passed += 1;
  else {
    results.failed += 1;
    failures.push(name);
  }
}

check('typecheck', 'npx', ['tsc', '-b']);
check('lint', 'npx', ['eslint', '.', '--max-warnings', '0']);
check('format', 'npx', ['prettier', '--check', '.', '--log-level', 'warn']);
check('client build', 'npx', ['vite', 'build', '--logLevel', 'warn']);

const reportDir = '.vitest-results';
rmSync(reportDir, { recursive: true, force: true });
mkdirSync(reportDir, { recursive: true });
const reportFile = `${reportDir}/report.json`;
step('tests', 'npx', [
  'vitest',
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${reportFile}`,
]);
try {
  const report = JSON.parse(readFileSync(reportFile, 'utf8'));
  results.passed += report.numPassedTests;
  results.failed += report.numFailedTests;
  results.skipped += report.numPendingTests + (report.numTodoTests ?? 0);
  // A file that fails to load has no tests to count: count the file as one failure.
  for (const file of report.testResults ?? []) {
    if (file.status === 'failed' && (file.assertionResults ?? []).length === 0) {
      results.failed += 1;
      failures.push(`test file did not run: ${file.name}`);
    }
    for (const test of file.assertionResults ?? []) {
      if (test.status === 'failed') failures.push(test.fullName);
    }
  }
} catch (error) {
  results.failed += 1;
  failures.push(`no Vitest report (${error.message})`);
}

if (failures.length > 0) {
  console.log('\nFailed:');
  for (const name of failures) console.log(`  - ${name}`);
}
console.log(`\n${results.passed} passed, ${results.failed} failed, ${results.skipped} skipped`);
process.exit(results.failed === 0 ? 0 : 1);
