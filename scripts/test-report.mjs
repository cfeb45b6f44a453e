// The closing count of `npm test`, read from the machine-readable reports of vitest (JSON) and
// Playwright (JSON). Table-driven bad-input rows are reported apart from behaviour tests: a test is
// a bad-input row when its own title or the title of a `describe` around it starts with
// "bad input" (the naming convention of DEVELOPERS.md, "Tests"). Browser tests are behaviour tests.

const TABLE_ROW = /^bad input\b/i;

/** True for a vitest assertion that is one row of a bad-input table. */
export function isTableRow(assertion) {
  return [...(assertion.ancestorTitles ?? []), assertion.title ?? ''].some((title) => TABLE_ROW.test(title));
}

/**
 * Counts the tests of one run. `vitest` is vitest's JSON report (or null when it did not run),
 * `playwright` Playwright's (or null).
 * @returns {{ behaviour: { passed: number, failed: number }, tableRows: { passed: number, failed: number }, skipped: number }}
 */
export function countTests(vitest, playwright) {
  const behaviour = { passed: 0, failed: 0 };
  const tableRows = { passed: 0, failed: 0 };
  let skipped = 0;
  for (const file of vitest?.testResults ?? []) {
    for (const assertion of file.assertionResults ?? []) {
      const bucket = isTableRow(assertion) ? tableRows : behaviour;
      if (assertion.status === 'passed') bucket.passed++;
      else if (assertion.status === 'failed') bucket.failed++;
      else skipped++; // pending, skipped, todo
    }
  }
  if (playwright) {
    behaviour.passed += (playwright.stats?.expected ?? 0) + (playwright.stats?.flaky ?? 0);
    behaviour.failed += playwright.stats?.unexpected ?? 0;
    skipped += playwright.stats?.skipped ?? 0;
  }
  return { behaviour, tableRows, skipped };
}

/** The closing lines; the last one is the plain total CI reads ("Tests: N passed, N failed"). */
export function closingLines({ behaviour, tableRows, skipped }) {
  const passed = behaviour.passed + tableRows.passed;
  const failed = behaviour.failed + tableRows.failed;
  return [
    `Behaviour tests: ${behaviour.passed} passed, ${behaviour.failed} failed`,
    `Bad-input table rows: ${tableRows.passed} passed, ${tableRows.failed} failed`,
    `Tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`,
  ];
}
