// Adds up the JSON reports of every Vitest run of `npm test` into one closing line, and names each failed
// test with the first line of its error so a CI log's tail says what broke.
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';

const folder = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;
const failures = [];
for (const file of readdirSync(folder)
  .filter((name) => name.endsWith('.json'))
  .sort()) {
  const report = JSON.parse(readFileSync(join(folder, file), 'utf8'));
  const group = file.replace(/\.json$/, '');
  // A file that failed to load has no tests but still counts as one failure.
  const brokenFiles = report.testResults.filter((r) => r.status === 'failed' && r.assertionResults.length === 0);
  passed += report.numPassedTests;
  failed += report.numFailedTests + brokenFiles.length;
  skipped += report.numPendingTests + (report.numTodoTests ?? 0);
  console.log(
    `  ${group.padEnd(14)} ${report.numPassedTests} passed, ${report.numFailedTests + brokenFiles.length} failed`,
  );
  for (const result of report.testResults) {
    const where = relative(process.cwd(), result.name);
    if (result.assertionResults.length === 0 && result.status === 'failed') {
      failures.push(`${group}: ${where}: ${firstLine(result.message)}`);
    }
    for (const test of result.assertionResults.filter((t) => t.status === 'failed')) {
      failures.push(`${group}: ${where} › ${test.fullName}: ${firstLine(test.failureMessages?.[0])}`);
    }
  }
}
console.log(`${passed} passed, ${failed} failed, ${skipped} skipped`);
for (const failure of failures) console.log(`  FAILED ${failure}`);

function firstLine(text) {
  return (
    (text ?? '')
      .split('\n')
      .find((line) => line.trim() !== '')
      ?.trim()
      .slice(0, 300) ?? '(no message)'
  );
}
