export type Assertion = { ancestorTitles?: string[]; title?: string; status?: string };
export type Tally = { passed: number; failed: number };
export type TestCount = { behaviour: Tally; tableRows: Tally; skipped: number };
export declare function isTableRow(assertion: Assertion): boolean;
export declare function countTests(
  vitest: { testResults?: Array<{ assertionResults?: Assertion[] }> } | null,
  playwright: { stats?: { expected?: number; flaky?: number; unexpected?: number; skipped?: number } } | null,
): TestCount;
export declare function closingLines(count: TestCount): string[];
