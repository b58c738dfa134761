// Writes the closing line CI reads, `tests: N passed, N failed`, to $FL_TEST_SUMMARY (infra/test.sh
// prints it last) or to stdout. A suite that fails to load (syntax error, failing beforeAll)
// counts as one failure so it can never pass silently.
const fs = require('node:fs');

class SummaryReporter {
  onRunComplete(_contexts, results) {
    const brokenSuites = results.testResults.filter((r) => r.testExecError || (r.failureMessage && r.numFailingTests === 0)).length;
    const failed = results.numFailedTests + brokenSuites;
    const skipped = results.numPendingTests + results.numTodoTests;
    const line = `tests: ${results.numPassedTests} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`;
    if (process.env.FL_TEST_SUMMARY) fs.writeFileSync(process.env.FL_TEST_SUMMARY, line + '\n');
    else process.stdout.write(`\n${line}\n`);
  }
}
module.exports = SummaryReporter;
