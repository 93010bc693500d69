import fs from "node:fs"
import type { FullResult, Reporter, Suite } from "@playwright/test/reporter"

/** Ends the browser tests with the same `N passed, N failed, N skipped` line as the Vitest suites. */
export default class SummaryReporter implements Reporter {
  private root: Suite | null = null

  onBegin(_config: unknown, suite: Suite) {
    this.root = suite
  }

  onEnd(result: FullResult) {
    const counts = { passed: 0, failed: 0, skipped: 0 }
    for (const test of this.root?.allTests() ?? []) {
      const outcome = test.outcome()
      if (outcome === "expected") counts.passed++
      else if (outcome === "skipped") counts.skipped++
      else counts.failed++
    }
    // A run that ended before its tests (a failed global set-up, an interrupt) has failed.
    if (result.status !== "passed" && counts.failed === 0) counts.failed = 1
    process.stdout.write(`\n${counts.passed} passed, ${counts.failed} failed, ${counts.skipped} skipped\n`)
    if (process.env.TEST_SUMMARY_FILE) fs.appendFileSync(process.env.TEST_SUMMARY_FILE, `${JSON.stringify(counts)}\n`)
  }
}
