// Reads a runner's JSON report and prints "passed failed skipped" for scripts/test.sh.
// Usage: node results.mjs vitest|playwright FILE
import { readFileSync } from 'node:fs';

const [kind, file] = process.argv.slice(2);
let report;
try {
  report = JSON.parse(readFileSync(file, 'utf8'));
} catch {
  // No report means the runner died before writing one; the caller counts that as a failure.
  console.log('0 0 0');
  process.exit(0);
}

let passed = 0;
let failed = 0;
let skipped = 0;
if (kind === 'vitest') {
  passed = report.numPassedTests ?? 0;
  failed = report.numFailedTests ?? 0;
  skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
  // A file that fails to load has no failed tests of its own, but the suite failed.
  const brokenFiles = (report.testResults ?? []).filter(
    (r) => r.status === 'failed' && (r.assertionResults ?? []).every((a) => a.status !== 'failed'),
  ).length;
  failed += brokenFiles;
} else if (kind === 'playwright') {
  const stats = report.stats ?? {};
  passed = (stats.expected ?? 0) + (stats.flaky ?? 0);
  failed = stats.unexpected ?? 0;
  skipped = stats.skipped ?? 0;
  failed += (report.errors ?? []).length;
} else {
  console.error(`unknown report kind: ${kind}`);
  process.exit(2);
}
console.log(`${passed} ${failed} ${skipped}`);
