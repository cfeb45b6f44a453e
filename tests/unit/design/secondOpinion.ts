import 'fmin';

// fmin ships a UMD bundle inside a "type": "module" package: imported as ESM it exposes no
// named exports but registers itself on globalThis.fmin. Used only as an independent
// second opinion in tests.
export const fmin = (globalThis as unknown as { fmin: typeof import('fmin') }).fmin;

// fmin 0.0.4's nelderMead assigns an undeclared loop variable `i` in its shrink step, which
// throws under strict mode; a global of that name lets the step run unchanged.
(globalThis as unknown as { i: number }).i = 0;
