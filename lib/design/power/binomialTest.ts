import { DesignInputError } from '../DesignInputError';

export type Alternative = 'two-sided' | 'greater' | 'less';

const LOG_FACTORIAL: number[] = [0];
for (let i = 1; i <= 1024; i++) LOG_FACTORIAL[i] = LOG_FACTORIAL[i - 1] + Math.log(i);

/** ln n!: a table up to 1024, then Stirling's series with three correction terms (error < 1e-16 relative there). */
function logFactorial(n: number): number {
  if (n <= 1024) return LOG_FACTORIAL[n];
  const inv = 1 / n;
  const inv2 = inv * inv;
  return (n + 0.5) * Math.log(n) - n + 0.5 * Math.log(2 * Math.PI) + inv * (1 / 12 - inv2 * (1 / 360 - inv2 / 1260));
}

/** P(X ≤ x) and P(X ≥ x) for X ~ Binomial(n, 1/2), each summed over its own tail (no 1 − P cancellation). */
function halfTails(x: number, n: number): { lower: number; upper: number } {
  const base = logFactorial(n) - n * Math.LN2;
  let lower = 0;
  for (let i = 0; i <= x; i++) lower += Math.exp(base - logFactorial(i) - logFactorial(n - i));
  let upper = 0;
  for (let i = x; i <= n; i++) upper += Math.exp(base - logFactorial(i) - logFactorial(n - i));
  return { lower: Math.min(1, lower), upper: Math.min(1, upper) };
}

function checkCount(field: string, v: number): void {
  if (!(Number.isSafeInteger(v) && v >= 0)) throw new DesignInputError(field, 'a whole number, 0 or more', v);
}

/**
 * Exact binomial test of x successes in n trials against p = 1/2 (Clopper & Pearson's exact
 * binomial, as in Conover 1999, Practical Nonparametric Statistics, §3.1). 'greater' is
 * P(X ≥ x), 'less' P(X ≤ x); 'two-sided' doubles the smaller tail, capped at 1, which at
 * p = 1/2 (a symmetric distribution) equals summing every outcome no more likely than x.
 * n = 0 gives p = 1.
 *
 * @throws DesignInputError for counts that are not whole numbers ≥ 0, x > n, or an unknown alternative
 * @example binomialTestHalf(9, 10, 'greater').pValue // 11/1024 ≈ 0.01074
 */
export function binomialTestHalf(x: number, n: number, alternative: Alternative): { pValue: number } {
  checkCount('successes', x);
  checkCount('trials', n);
  if (x > n) throw new DesignInputError('successes', `at most the number of trials (${n})`, x);
  if (n === 0) {
    if (alternative !== 'two-sided' && alternative !== 'greater' && alternative !== 'less') failAlternative(alternative);
    return { pValue: 1 };
  }
  const tails = halfTails(x, n);
  switch (alternative) {
    case 'greater':
      return { pValue: tails.upper };
    case 'less':
      return { pValue: tails.lower };
    case 'two-sided':
      return { pValue: Math.min(1, 2 * Math.min(tails.lower, tails.upper)) };
    default:
      return failAlternative(alternative);
  }
}

function failAlternative(value: unknown): never {
  throw new DesignInputError('alternative', "'two-sided', 'greater' or 'less'", value);
}

/**
 * Exact McNemar test (McNemar 1947, Psychometrika 12:153–157) on the discordant patterns of
 * question pairs: b = number of LS patterns (reversals), c = number of SL patterns (reverse
 * reversals). Under the null hypothesis each discordant pair is LS with probability 1/2, so
 * the test is the exact binomial test of b in b + c trials at 1/2. 'greater' tests more LS
 * than SL.
 *
 * @throws DesignInputError for counts that are not whole numbers ≥ 0 or an unknown alternative
 * @example mcnemarExactTest(9, 1, 'two-sided').pValue // 22/1024 ≈ 0.02148
 */
export function mcnemarExactTest(b: number, c: number, alternative: Alternative): { pValue: number } {
  checkCount('b', b);
  checkCount('c', c);
  return binomialTestHalf(b, b + c, alternative);
}

/**
 * Sign test (Conover 1999, §3.4): `positive` participants scored above 0, `negative` below;
 * ties are dropped. The exact binomial test of positive in positive + negative at 1/2.
 *
 * @example signTest(8, 2, 'greater').pValue // 56/1024 ≈ 0.05469
 */
export function signTest(positive: number, negative: number, alternative: Alternative): { pValue: number } {
  checkCount('positive', positive);
  checkCount('negative', negative);
  return binomialTestHalf(positive, positive + negative, alternative);
}
