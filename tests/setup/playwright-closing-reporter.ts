import type { FullResult, Reporter, Suite, TestError } from '@playwright/test/reporter';
import { appendFileSync } from 'node:fs';

/**
 * Prints `playwright: N passed, N failed` and, when FP_COUNTS_FILE is set, appends
 * `playwright P F` for the overall total. A test counts once by its final outcome (a flaky
 * test that passed on retry counts as passed); an error outside any test (web server did not
 * start, a file did not load) counts as one failure so it is never lost.
 */
export default class PlaywrightClosingReporter implements Reporter {
  private root: Suite | null = null;
  private globalErrors = 0;

  onBegin(_config: unknown, suite: Suite) {
    this.root = suite;
  }

  onError(_error: TestError) {
    this.globalErrors++;
  }

  printsToStdio() {
    return true;
  }

  onEnd(result: FullResult) {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    let flaky = 0;
    for (const test of this.root?.allTests() ?? []) {
      const outcome = test.outcome();
      if (outcome === 'expected') passed++;
      else if (outcome === 'flaky') {
        passed++;
        flaky++;
      } else if (outcome === 'unexpected') failed++;
      else skipped++;
    }
    failed += this.globalErrors;
    if (result.status !== 'passed' && failed === 0) failed = 1;
    let line = `playwright: ${passed} passed, ${failed} failed`;
    if (skipped) line += `, ${skipped} skipped`;
    console.log(line + (flaky ? ` (${flaky} flaky: passed on retry)` : ''));
    if (process.env.FP_COUNTS_FILE) appendFileSync(process.env.FP_COUNTS_FILE, `playwright ${passed} ${failed}\n`);
  }
}
