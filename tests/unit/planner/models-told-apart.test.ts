import { describe, expect, it } from 'vitest';
import { compareRows, modelsToldApart, TOLD_APART_PARTICIPANTS } from '@/lib/shared/planner/compare';
import { defaultSpec, toForm, toSpec } from '@/lib/shared/planner/design-form-values';
import { computeDesignSummary } from '@/lib/shared/planner/summary';
import { designSpecSchema, type PriorValues } from '@/lib/shared/validations/planner';

const prior: PriorValues = { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 0.8, sdLogLarge: 0.8, correlation: 0.7 };

describe('compare view: models told apart (docs/mathematics.md, "Model discrimination")', () => {
  const gap = { spec: { ...defaultSpec('Gap', 1), choiceSensitivity: 10 }, prior };
  const kl = { spec: { ...defaultSpec('Discriminate', 1), choiceSensitivity: 10, criterion: 'model-discrimination' as const }, prior };

  it('gives each design a seeded share for both truths, reproducible, from its own probe placement', () => {
    const summaries = [computeDesignSummary(gap), computeDesignSummary(kl)];
    const rows = compareRows([gap, kl], summaries);
    const overall = rows.find((r) => r.key === 'models-told-apart')!;
    const h = rows.find((r) => r.key === 'told-apart-hyperbolic')!;
    const e = rows.find((r) => r.key === 'told-apart-exponential')!;
    for (let i = 0; i < 2; i++) {
      expect(overall.values[i]).toBeCloseTo((h.values[i]! + e.values[i]!) / 2, 12);
      // a share of TOLD_APART_PARTICIPANTS participants counted in halves
      expect(Number.isInteger(h.values[i]! * TOLD_APART_PARTICIPANTS * 2)).toBe(true);
      expect(h.values[i]).toBeGreaterThan(0.5);
      expect(h.values[i]).toBeLessThanOrEqual(1);
    }
    expect(overall.note).toMatch(/1000 participants/);
    expect(modelsToldApart(kl, summaries[1])).toEqual(modelsToldApart(kl, summaries[1]));
    // the discrimination design's probes differ from the gap-product design's, so the figures do
    expect(h.values[0]).not.toBe(h.values[1]);
    console.log(`models told apart (N = ${TOLD_APART_PARTICIPANTS} per truth): gap product ${overall.values[0]} (${h.values[0]}/${e.values[0]}), model discrimination ${overall.values[1]} (${h.values[1]}/${e.values[1]})`);
  });

  it('the planner puts a discrimination design’s typical probe where the divergence is largest, not at the gap-product optimum', () => {
    const a = computeDesignSummary(gap);
    const b = computeDesignSummary(kl);
    expect(b.typical.optimum!.lateDelay).toBeCloseTo(a.typical.optimum!.lateDelay, 9);
    expect(b.roles[1].lateDelay).not.toBeCloseTo(a.roles[1].lateDelay!, 0);
  });
});

describe('design spec: the model-discrimination criterion', () => {
  it('accepts the criterion with a reversal weight, and names the field of a bad weight', () => {
    const spec = { ...defaultSpec('x', 1), criterion: 'model-discrimination' as const, reversalWeight: 2 };
    expect(designSpecSchema.parse(spec)).toEqual(spec);
    const bad = designSpecSchema.safeParse({ ...spec, reversalWeight: -1 });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0].path).toEqual(['reversalWeight']);
    const stray = designSpecSchema.safeParse({ ...defaultSpec('x', 1), reversalWeight: 1 });
    expect(stray.error!.issues.map((i) => i.path.join('.'))).toEqual(['reversalWeight']);
    const unknown = designSpecSchema.safeParse({ ...defaultSpec('x', 1), criterion: 'discriminate' });
    expect(unknown.error!.issues[0].path).toEqual(['criterion']);
  });

  it('the form keeps the weight only for that criterion, so other designs keep their spec and hash', () => {
    const plain = defaultSpec('x', 1);
    expect(toSpec(toForm(plain))).toEqual(plain);
    const form = { ...toForm(plain), criterion: 'model-discrimination' as const, reversalWeight: 0.5 };
    expect(toSpec(form).reversalWeight).toBe(0.5);
    expect('reversalWeight' in toSpec({ ...form, criterion: 'gap-product' })).toBe(false);
  });
});
