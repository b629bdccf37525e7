// CI reads one closing line "N passed, N failed[, N skipped]" alone on a line;
// vitest's own summary has another form, so this reporter prints ours last.
export default class ClosingLineReporter {
  onTestRunEnd(testModules, unhandledErrors) {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const module of testModules) {
      for (const test of module.children.allTests()) {
        const state = test.result().state;
        if (state === "passed") passed++;
        else if (state === "failed") failed++;
        else skipped++;
      }
      // A file that fails to load has no tests: count it as a failure.
      if (module.state() === "failed" && [...module.children.allTests()].length === 0) failed++;
    }
    failed += unhandledErrors?.length ?? 0;
    process.stdout.write(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}\n`);
  }
}
