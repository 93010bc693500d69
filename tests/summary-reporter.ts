import fs from "node:fs"
import type { Reporter, TestModule } from "vitest/node"

/** Ends the run with the plain `N passed, N failed, N skipped` line that CI reads. */
export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>) {
    let passed = 0
    let failed = 0
    let skipped = 0
    for (const mod of testModules) {
      for (const test of mod.children.allTests()) {
        const state = test.result().state
        if (state === "passed") passed++
        else if (state === "failed") failed++
        else skipped++
      }
      if (mod.state() === "failed" && ![...mod.children.allTests()].length) failed++
    }
    process.stdout.write(`\n${passed} passed, ${failed} failed, ${skipped} skipped\n`)
    // npm test adds these to the browser tests' counts for its last line.
    if (process.env.TEST_SUMMARY_FILE)
      fs.appendFileSync(process.env.TEST_SUMMARY_FILE, `${JSON.stringify({ passed, failed, skipped })}\n`)
  }
}
