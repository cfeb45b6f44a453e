import { describe, expect, it } from 'vitest';
import { canonicalJson, contentHash } from '@/lib/shared/canonical-json';
import { createHash } from 'node:crypto';
import { defaultSpec, designFormSchema, toForm, toSpec } from '@/lib/shared/planner/design-form-values';
import { commentSchema, designSpecSchema, designUpdateSchema, frozenDesignSchema, priorSetSchema, priorSetUpdateSchema, type DesignSpec } from '@/lib/shared/validations/planner';
import reference from '../../fixtures/reference/reference.json';

const population: DesignSpec = {
  ...defaultSpec('Population check', 3),
  model: { id: 'quasi-hyperbolic', presentBias: 0.8 },
  mode: 'population',
  soonDelay: { mode: 'optimised', min: 7, max: 60 },
  criterion: 'maximin',
};

describe('schema round trips', () => {
  it('a design spec survives JSON and parses to itself', () => {
    for (const spec of [defaultSpec('Fortnight', 1), population]) {
      expect(designSpecSchema.parse(JSON.parse(JSON.stringify(spec)))).toEqual(spec);
    }
  });

  it('the form values of a spec give back the same spec, and the form schema accepts them', () => {
    for (const spec of [defaultSpec('Fortnight', 1), population, { ...population, model: { id: 'hyperboloid' as const, sensitivity: 0.7 } }]) {
      expect(toSpec(toForm(spec))).toEqual(spec);
      expect(designFormSchema.parse(toForm(spec))).toEqual(spec);
    }
  });

  it('the form drops s and β for models without them, and the bounds of a fixed soon delay', () => {
    const form = toForm(defaultSpec('Fortnight', 1));
    form.model.sensitivity = 0.3;
    const spec = toSpec(form);
    expect(spec.model).toEqual({ id: 'hyperbolic' });
    expect(spec.soonDelay).toEqual({ mode: 'fixed', days: 14 });
  });

  it('a prior set, an update, a frozen design and a comment parse back to themselves', () => {
    const prior = priorSetSchema.parse({ name: 'Pilot', medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 0.5, correlation: 0.3 });
    expect(prior).toMatchObject({ source: 'manual', notes: '' });
    expect(priorSetSchema.parse(JSON.parse(JSON.stringify(prior)))).toEqual(prior);
    const update = { prior, version: 4 };
    expect(priorSetUpdateSchema.parse(JSON.parse(JSON.stringify(update)))).toEqual(update);
    const frozen = { spec: population, prior: { name: 'Pilot', medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 0.5, correlation: 0.3 } };
    expect(frozenDesignSchema.parse(JSON.parse(JSON.stringify(frozen)))).toEqual(frozen);
    expect(designUpdateSchema.parse({ spec: population, version: 2 })).toEqual({ spec: population, version: 2 });
    expect(commentSchema.parse({ text: '  fine  ' })).toEqual({ text: 'fine' });
  });

  it('refuses bad input naming the field', () => {
    const bad = designSpecSchema.safeParse({ ...population, ratio: 1.5, soonDelay: { mode: 'optimised', min: 30, max: 7 }, colour: 'teal' });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['ratio']));
    expect(paths.some((p) => p === '' || p === 'colour')).toBe(true);
    const soon = designSpecSchema.safeParse({ ...population, soonDelay: { mode: 'optimised', min: 30, max: 7 } });
    expect(soon.error!.issues.map((i) => i.path.join('.'))).toContain('soonDelay.max');
    const limit = designSpecSchema.safeParse({ ...defaultSpec('x', 1), lateDelayLimit: 10, soonDelay: { mode: 'fixed', days: 14 } });
    expect(limit.error!.issues.map((i) => i.path.join('.'))).toContain('lateDelayLimit');
  });
});

describe('the canonical hash', () => {
  it('is the same whatever order the keys were written in, at every level', () => {
    const a = { spec: population, prior: { name: 'P', medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 } };
    const reversed = (v: unknown): unknown =>
      Array.isArray(v) ? v.map(reversed) : v && typeof v === 'object' ? Object.fromEntries(Object.entries(v).reverse().map(([k, x]) => [k, reversed(x)])) : v;
    const b = reversed(a);
    expect(JSON.stringify(b)).not.toBe(JSON.stringify(a));
    expect(canonicalJson(b)).toBe(canonicalJson(a));
    expect(contentHash(b)).toBe(contentHash(a));
  });

  it('changes when any value changes, and keeps array order', () => {
    const a = { spec: population, prior: { name: 'P', medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 } };
    expect(contentHash({ ...a, prior: { ...a.prior, correlation: 0.01 } })).not.toBe(contentHash(a));
    expect(contentHash([1, 2])).not.toBe(contentHash([2, 1]));
  });

  it('is the SHA-256 of sorted-key JSON without white space', () => {
    // Hand-written canonical text, hashed directly with node:crypto as the second opinion.
    expect(canonicalJson({ b: [2, { d: 1, c: 'x' }], a: 1 })).toBe('{"a":1,"b":[2,{"c":"x","d":1}]}');
    expect(contentHash({ b: [2, { d: 1, c: 'x' }], a: 1 })).toBe(createHash('sha256').update('{"a":1,"b":[2,{"c":"x","d":1}]}').digest('hex'));
    // SHA-256 of "{}" computed by Python's hashlib (tests/fixtures/reference)
    expect(contentHash({})).toBe(reference.sha256.find((r) => r.text === '{}')!.hex);
    expect(contentHash({})).toBe(createHash('sha256').update('{}').digest('hex'));
  });
});
