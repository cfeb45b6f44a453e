import { describe, expect, it } from 'vitest';
import { closingLines, countTests, isTableRow } from '@/scripts/test-report.mjs';

// The closing count of `npm test` (scripts/test.mjs) reads vitest's and Playwright's JSON reports.
const vitest = {
  testResults: [
    {
      assertionResults: [
        { ancestorTitles: ['bad input throws DesignInputError naming the field'], title: 'discountFactor: rate = NaN', status: 'passed' },
        { ancestorTitles: ['route ids'], title: 'bad input: "0" is no id', status: 'passed' },
        { ancestorTitles: ['route ids'], title: 'bad input: "x" is no id', status: 'failed' },
        { ancestorTitles: ['reversal zone'], title: 'is empty when small rewards are discounted no faster', status: 'passed' },
        { ancestorTitles: ['reversal zone'], title: 'mentions bad input in passing but is a behaviour', status: 'failed' },
        { ancestorTitles: [], title: 'a todo', status: 'todo' },
      ],
    },
  ],
};
const playwright = { stats: { expected: 14, flaky: 1, unexpected: 0, skipped: 2 } };

describe('the closing count of npm test', () => {
  it('counts a test as a table row when its title or a describe around it starts with "bad input"', () => {
    expect(isTableRow({ ancestorTitles: ['Bad input rows'], title: 'x' })).toBe(true);
    expect(isTableRow({ ancestorTitles: [], title: 'bad input: NaN' })).toBe(true);
    expect(isTableRow({ ancestorTitles: ['schemas'], title: 'refuses bad input' })).toBe(false);
  });

  it('reports behaviour tests and table rows apart, browser tests as behaviour, and keeps the plain total last', () => {
    const count = countTests(vitest, playwright);
    expect(count).toEqual({ behaviour: { passed: 16, failed: 1 }, tableRows: { passed: 2, failed: 1 }, skipped: 3 });
    expect(closingLines(count)).toEqual([
      'Behaviour tests: 16 passed, 1 failed',
      'Bad-input table rows: 2 passed, 1 failed',
      'Tests: 18 passed, 2 failed, 3 skipped',
    ]);
  });

  it('counts nothing when neither tool ran', () => {
    expect(closingLines(countTests(null, null)).at(-1)).toBe('Tests: 0 passed, 0 failed');
  });
});
