// Prints vitest's totals as one plain line ("N passed, N failed, N skipped")
// so a CI log reader that does not know vitest can still count the tests.
import { readFileSync } from 'node:fs';

const report = JSON.parse(readFileSync(new URL('../test-artifacts/vitest.json', import.meta.url), 'utf8'));
const passed = report.numPassedTests ?? 0;
const failed = report.numFailedTests ?? 0;
const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
console.log(`tests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
process.exitCode = failed > 0 || report.success === false ? 1 : 0;
