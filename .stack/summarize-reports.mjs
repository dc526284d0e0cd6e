// Adds up the JSON reports of every Vitest run of `npm test` into one closing line.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const folder = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;
for (const file of readdirSync(folder).filter((name) => name.endsWith('.json')).sort()) {
  const report = JSON.parse(readFileSync(join(folder, file), 'utf8'));
  // A file that failed to load has no tests but still counts as one failure.
  const brokenFiles = report.testResults.filter((r) => r.status === 'failed' && r.assertionResults.length === 0).length;
  passed += report.numPassedTests;
  failed += report.numFailedTests + brokenFiles;
  skipped += report.numPendingTests + (report.numTodoTests ?? 0);
  console.log(`  ${file.replace(/\.json$/, '').padEnd(14)} ${report.numPassedTests} passed, ${report.numFailedTests + brokenFiles} failed`);
}
console.log(`${passed} passed, ${failed} failed, ${skipped} skipped`);
