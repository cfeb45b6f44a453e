import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { fieldLabel } from '@/lib/shared/validations/error-map';
import { designUpdateSchema, priorValuesSchema } from '@/lib/shared/validations/planner';
import { parseJsonText } from '@/lib/server/http/read-json';
import { ValidationError } from '@/lib/server/errors';

const prior = { medianSmall: 0.02, medianLarge: 0.01, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 };

function messages(schema: z.ZodType, value: unknown): Record<string, string> {
  const parsed = schema.safeParse(value);
  if (parsed.success) throw new Error('expected a failure');
  return Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message]));
}

describe('validation messages speak with one voice and name the field', () => {
  it('words a bound the schema left unworded as a sentence with the field’s name (no "Too small: expected number to be >=0")', () => {
    const m = messages(z.strictObject({ lateAnchors: z.number().int().min(0).max(10) }), { lateAnchors: -1 });
    expect(m.lateAnchors).toBe('The number of late anchors must be 0 or more.');
    const big = messages(z.strictObject({ lateAnchors: z.number().int().min(0).max(10) }), { lateAnchors: 11 });
    expect(big.lateAnchors).toBe('The number of late anchors must be at most 10.');
  });

  it('says a field is required when it is missing, and must be a number when a form sends NaN', () => {
    const m = messages(priorValuesSchema, { ...prior, sdLogSmall: undefined, correlation: Number.NaN });
    expect(m.sdLogSmall).toBe('The spread (SD of ln k) for the small reward is required.');
    expect(m.correlation).toBe('The correlation must be a number.');
  });

  it('says "a whole number" for an integer field given a fraction', () => {
    const m = messages(z.strictObject({ probePairs: z.number().int() }), { probePairs: 2.5 });
    expect(m.probePairs).toBe('The number of reversal probes must be a whole number.');
  });

  it('lists the allowed choices of an enum and names unknown fields', () => {
    const m = messages(z.strictObject({ criterion: z.enum(['gap-product', 'maximin']) }), { criterion: 'best', extra: 1 });
    expect(m.criterion).toBe('The criterion must be one of “gap-product”, “maximin”.');
    expect(m['']).toBe('This field is not accepted here: extra.');
  });

  it('keeps the sentences a schema words itself', () => {
    const m = messages(priorValuesSchema, { ...prior, correlation: 2 });
    expect(m.correlation).toBe('Correlation must be between −0.99 and 0.99.');
  });

  it('names nested fields by their own label (soon delay inside a design)', () => {
    const parsed = designUpdateSchema.safeParse({ spec: { soonDelay: { mode: 'fixed', days: -3 } }, version: 1 });
    expect(parsed.success).toBe(false);
    const days = parsed.error!.issues.find((i) => i.path.join('.') === 'spec.soonDelay.days');
    expect(days?.message).toBe('The soon delay d must be 0 or more.');
  });

  it('gives the server’s 422 the same words as the form (one map on both sides)', () => {
    try {
      parseJsonText(JSON.stringify({ ...prior, sdLogLarge: 'wide' }), priorValuesSchema);
      throw new Error('expected a ValidationError');
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      expect((error as ValidationError).issues).toEqual([{ path: 'sdLogLarge', message: 'The spread (SD of ln K) for the large reward must be a number.' }]);
    }
  });

  it('falls back to the key in words for a field without a label', () => {
    expect(fieldLabel(['spec', 'someNewThing'])).toBe('The field “some new thing”');
    expect(fieldLabel(['sampleSizes', 2])).toBe('The sample sizes');
  });
});
