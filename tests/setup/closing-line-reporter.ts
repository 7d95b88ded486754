import type { Reporter, TestModule } from 'vitest/node';
import { appendFileSync } from 'node:fs';

/** Prints `N passed, N failed` and, when FP_COUNTS_FILE is set, appends the counts for the overall total. */
export default class ClosingLineReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>) {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const mod of testModules) {
      for (const t of mod.children.allTests()) {
        const state = t.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
      if (mod.state() === 'failed' && mod.children.size === 0) failed++;
    }
    const line = `vitest: ${passed} passed, ${failed} failed` + (skipped ? `, ${skipped} skipped` : '');
    console.log(line);
    if (process.env.FP_COUNTS_FILE) appendFileSync(process.env.FP_COUNTS_FILE, `vitest ${passed} ${failed}\n`);
  }
}
