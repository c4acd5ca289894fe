// A vitest reporter that ends the run with one plain line, "tests: N passed, N failed", so that any
// reader of the log (people and CI alike) sees the count without knowing vitest's own format.
import type { Reporter, TestModule } from 'vitest/node';

export default class PlainSummary implements Reporter {
  onTestRunEnd(modules: ReadonlyArray<TestModule>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const m of modules) {
      let failedHere = 0;
      for (const t of m.children.allTests()) {
        const state = t.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failedHere++;
        else skipped++;
      }
      // A file that failed outside its tests (import error, failing beforeAll) counts as one failure.
      if (m.state() === 'failed' && failedHere === 0) failedHere = 1;
      failed += failedHere;
    }
    process.stdout.write(`\ntests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}\n`);
  }
}
