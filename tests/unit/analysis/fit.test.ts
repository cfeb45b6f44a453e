import { describe, expect, it } from 'vitest';
import {
  DesignInputError,
  estimateRates,
  FIT_BOUNDS,
  fitModel,
  MODEL_IDS,
  participantChoices,
  simulateStudy,
  type FitChoice,
  type ModelId,
  type ModelSpec,
} from '@/lib/design';
import { choiceLogLikelihood, likelihoodScratch, packChoices } from '@/lib/design/analysis/choiceLikelihood';
import { fmin } from '../design/secondOpinion';
import { design, referenceLogLikelihood, truth } from './support';

const choice = { sensitivity: 10 };
const TRUTHS: Record<ModelId, ModelSpec> = {
  exponential: { id: 'exponential' },
  hyperbolic: { id: 'hyperbolic' },
  hyperboloid: { id: 'hyperboloid', sensitivity: 0.6 },
  'power-delay': { id: 'power-delay', sensitivity: 0.7 },
  'exponential-power': { id: 'exponential-power', sensitivity: 0.5 },
  'quasi-hyperbolic': { id: 'quasi-hyperbolic', presentBias: 0.75 },
};

function people(id: ModelId, n: number, seed: number, gamma = 10) {
  return simulateStudy({ design: design(), truth: truth(TRUTHS[id], gamma), participants: n, seed }).map((p) => {
    const c = participantChoices(p);
    return [...c.calibration, ...c.stage2];
  });
}

const SHAPE = { hyperboloid: 'sensitivity', 'power-delay': 'sensitivity', 'exponential-power': 'sensitivity', 'quasi-hyperbolic': 'presentBias' } as const;

/** Best of several Nelder–Mead runs (fmin, an independent optimiser from npm) on the reference likelihood, parameters on the log scale clamped to the fit's bounds. */
function nelderMeadBest(id: ModelId, choices: FitChoice[]) {
  const shape = SHAPE[id as keyof typeof SHAPE];
  const lo = [Math.log(FIT_BOUNDS.rate.lower), Math.log(FIT_BOUNDS.rate.lower), shape ? Math.log(FIT_BOUNDS[shape].lower) : 0];
  const hi = [Math.log(FIT_BOUNDS.rate.upper), Math.log(FIT_BOUNDS.rate.upper), shape ? Math.log(FIT_BOUNDS[shape].upper) : 0];
  const clampAt = (v: number[]) => v.map((x, j) => Math.min(hi[j], Math.max(lo[j], x)));
  const negative = (v: number[]) => {
    const [a, b, c] = clampAt([...v, 0].slice(0, 3));
    const model: ModelSpec = shape === 'sensitivity' ? { id, sensitivity: Math.exp(c) } : shape === 'presentBias' ? { id, presentBias: Math.exp(c) } : { id };
    return -referenceLogLikelihood(model, { kSmall: Math.exp(a), kLarge: Math.exp(b) }, choices, choice.sensitivity);
  };
  let best = { x: [0, 0, 0], fx: Infinity };
  for (const lnK of [Math.log(1e-4), Math.log(0.003), Math.log(0.03), Math.log(0.3)]) {
    for (const third of shape ? [Math.log(0.5), 0] : [null]) {
      const start = third === null ? [lnK, lnK] : [lnK, lnK, third === 0 && shape === 'presentBias' ? -0.05 : third];
      const run = fmin.nelderMead(negative, start, { maxIterations: 4000, minErrorDelta: 1e-12, minTolerance: 1e-10 });
      if (run.fx < best.fx) best = { x: clampAt([...run.x, 0].slice(0, 3)), fx: run.fx };
    }
  }
  return best;
}

describe('maximum-likelihood refit of one participant', () => {
  it('reaches the maximum an independent multi-start Nelder–Mead (fmin) finds, for every model', () => {
    // source: fmin 0.0.4 nelderMead (npm), 4 to 8 starts, on a likelihood written from the definitions
    for (const id of MODEL_IDS) {
      for (const choices of people(id, 3, 11)) {
        const fit = fitModel(choices, { model: { id }, choice });
        const nm = nelderMeadBest(id, choices);
        // both maximise the same function; Nelder–Mead stops within ~1e-9 of its optimum, so a
        // log-likelihood 1e-6 below it would be a real miss
        expect(fit.logLikelihood).toBeGreaterThanOrEqual(-nm.fx - 1e-6);
        expect(fit.converged).toBe(true);
        // where the maximum is interior and well defined, the arguments agree on the log scale
        if (!fit.kSmall.atBound && fit.kSmall.standardErrorLog !== null && fit.kSmall.standardErrorLog < 1) {
          expect(Math.abs(Math.log(fit.kSmall.value) - nm.x[0])).toBeLessThan(1e-3);
        }
      }
    }
  });

  it('returns the log-likelihood the definitions give at its estimate, and AIC and BIC from it by hand', () => {
    for (const id of MODEL_IDS) {
      const [choices] = people(id, 1, 5);
      const fit = fitModel(choices, { model: { id }, choice });
      const model: ModelSpec = { id, sensitivity: fit.parameters.sensitivity, presentBias: fit.parameters.presentBias };
      const ll = referenceLogLikelihood(model, fit.parameters, choices, choice.sensitivity);
      // sums of ~56 logs of probabilities: 1e-10 relative is honest
      expect(Math.abs(fit.logLikelihood - ll)).toBeLessThan(1e-10 * Math.abs(ll));
      const p = id === 'exponential' || id === 'hyperbolic' ? 2 : 3;
      expect(fit.parameterCount).toBe(p);
      expect(fit.choiceCount).toBe(choices.length);
      // AIC = 2p − 2 ln L (Akaike 1974); BIC = p ln n − 2 ln L (Schwarz 1978), recomputed here
      expect(fit.aic).toBeCloseTo(2 * p - 2 * ll, 8);
      expect(fit.bic).toBeCloseTo(p * Math.log(choices.length) - 2 * ll, 8);
    }
  });

  it('agrees with estimateRates (Brent per magnitude) when fitting calibration choices with the design model held fixed', () => {
    // source: estimateRates, the serving estimator (grid + Brent on each magnitude separately)
    const data = simulateStudy({ design: design(), truth: truth({ id: 'hyperbolic' }, 10), participants: 6, seed: 2 });
    for (const p of data) {
      const items = p.calibration.map((c) => ({ ...c, targetRate: Number.NaN }));
      const reference = estimateRates(p.calibration.map((c) => (c.choice === 'later' ? 'LL' : 'SS')), items, { id: 'hyperbolic' });
      if (reference.small.flags.length || reference.large.flags.length) continue;
      const fit = fitModel(participantChoices(p).calibration, { model: { id: 'hyperbolic' }, shape: 'fixed', choice });
      // Brent stops at ~1e-8 in ln k; Newton converges further: 1e-6 on ln k is honest
      expect(Math.abs(Math.log(fit.kSmall.value) - reference.small.logRate)).toBeLessThan(1e-6);
      expect(Math.abs(Math.log(fit.kLarge.value) - reference.large.logRate)).toBeLessThan(1e-6);
      // estimateRates' SE comes from a second difference of the likelihood (h = 1e-3): 1e-4 relative
      expect(fit.kSmall.standardErrorLog! / reference.small.standardErrorLog! - 1).toBeLessThan(1e-4);
    }
  });

  it('has an analytic gradient and observed information that match central differences of the likelihood', () => {
    for (const id of MODEL_IDS) {
      const [choices] = people(id, 1, 9);
      const data = packChoices(choices);
      const theta: [number, number, number] = [Math.log(0.02), Math.log(0.006), id === 'quasi-hyperbolic' ? Math.log(0.8) : Math.log(0.7)];
      const scratch = likelihoodScratch();
      choiceLogLikelihood(id, data, theta, 10, 0.03, scratch);
      const h = 1e-5;
      for (let j = 0; j < 3; j++) {
        const up = [...theta] as typeof theta;
        const down = [...theta] as typeof theta;
        up[j] += h;
        down[j] -= h;
        const numeric = (choiceLogLikelihood(id, data, up, 10, 0.03) - choiceLogLikelihood(id, data, down, 10, 0.03)) / (2 * h);
        // central difference error O(h²) plus rounding ~1e-16/h: 1e-6 absolute on a gradient of order 1–10
        expect(Math.abs(scratch.gradient[j] - numeric)).toBeLessThan(1e-6 * (1 + Math.abs(numeric)));
        const gUp = likelihoodScratch();
        const gDown = likelihoodScratch();
        choiceLogLikelihood(id, data, up, 10, 0.03, gUp);
        choiceLogLikelihood(id, data, down, 10, 0.03, gDown);
        for (let i = 0; i < 3; i++) {
          const second = -(gUp.gradient[i] - gDown.gradient[i]) / (2 * h);
          expect(Math.abs(scratch.observed[j * 3 + i] - second)).toBeLessThan(1e-5 * (1 + Math.abs(second)));
        }
      }
    }
  });

  it('holds a shape parameter at its bound and reports no interval for it', () => {
    // exponential choosers: β̂ = 1 is common; the bound is reported, not hidden
    const fits = people('exponential', 8, 3).map((c) => fitModel(c, { model: { id: 'quasi-hyperbolic' }, choice }));
    const atOne = fits.filter((f) => f.shape!.atBound);
    expect(atOne.length).toBeGreaterThan(0);
    for (const f of atOne) {
      expect(f.parameters.presentBias).toBeLessThanOrEqual(1);
      expect(f.shape!.interval).toBeNull();
    }
  });

  it('refuses bad input with DesignInputError naming the field', () => {
    const good: FitChoice = { soonerAmount: 5, soonerDelay: 0, soonerMagnitude: 'small', laterAmount: 10, laterDelay: 7, laterMagnitude: 'small', later: true };
    const cases: Array<[unknown, unknown, string]> = [
      [[], { model: { id: 'hyperbolic' }, choice }, 'choices'],
      [[{ ...good, soonerAmount: 12 }], { model: { id: 'hyperbolic' }, choice }, 'choices[0].soonerAmount'],
      [[{ ...good, laterDelay: 0 }], { model: { id: 'hyperbolic' }, choice }, 'choices[0].laterDelay'],
      [[{ ...good, laterMagnitude: 'huge' }], { model: { id: 'hyperbolic' }, choice }, 'choices[0].laterMagnitude'],
      [[good], { model: { id: 'hyperbolic' }, choice: { sensitivity: 0 } }, 'choice.sensitivity'],
      [[good], { model: { id: 'cubic' }, choice }, 'model.id'],
      [[good], { model: { id: 'hyperbolic' }, choice, confidence: 1 }, 'confidence'],
    ];
    for (const [choices, options, field] of cases) {
      try {
        fitModel(choices as FitChoice[], options as never);
        expect.unreachable(`expected ${field} to be refused`);
      } catch (error) {
        expect(error).toBeInstanceOf(DesignInputError);
        expect((error as DesignInputError).field).toBe(field);
      }
    }
  });
});
