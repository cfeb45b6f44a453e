import { describe, expect, it } from 'vitest';
import { freeText, hasControlCharacter, hasLoneSurrogate, nameText } from '@/lib/shared/validations/text';
import { studySchema } from '@/lib/shared/validations/study';
import { signUpSchema } from '@/lib/shared/validations/user';
import { apiKeyCreateSchema } from '@/lib/shared/validations/api-keys';
import { commentSchema, priorSetSchema } from '@/lib/shared/validations/planner';

const name = nameText({ label: 'The name', min: 2, max: 20 });

describe('the rule for names', () => {
  it('keeps letters of every script and whole emoji, trimmed', () => {
    expect(name.parse('  Åsa Ñúñez 🌧️ ')).toBe('Åsa Ñúñez 🌧️');
    expect(name.parse('李小龍')).toBe('李小龍');
  });

  it('refuses a lone surrogate of either half, naming what is wrong', () => {
    for (const bad of ['Rain \uD83C', '\uDF27 day', 'a\uDC00\uD800b']) {
      const result = name.safeParse(bad);
      expect(result.success, JSON.stringify(bad)).toBe(false);
      expect(result.error?.issues[0].message).toMatch(/^The name contains a broken character/);
    }
    expect(hasLoneSurrogate('\uD83C\uDF27')).toBe(false); // a whole pair is one character
  });

  it('refuses C0 and C1 control characters, line breaks and tabs included', () => {
    for (const bad of ['Rain\nday', 'Rain\tday', 'Rain\u0000', '\u007FRain', 'Rain\u0085day', 'Rain\u009Bday']) {
      const result = name.safeParse(bad);
      expect(result.success, JSON.stringify(bad)).toBe(false);
      expect(result.error?.issues).toHaveLength(1);
      expect(result.error?.issues[0].message).toMatch(/control character/);
    }
  });

  it('still says when a name is too short or too long', () => {
    expect(name.safeParse(' a ').error?.issues[0].message).toBe('The name needs at least 2 characters.');
    expect(name.safeParse('x'.repeat(21)).error?.issues[0].message).toBe('The name must be at most 20 characters.');
  });
});

describe('the rule for free text', () => {
  const text = freeText({ label: 'The notes', max: 50 });
  it('allows line breaks and tabs but no other control characters or lone surrogates', () => {
    expect(text.parse('line one\r\nline\ttwo')).toBe('line one\r\nline\ttwo');
    expect(text.safeParse('bell\u0007').success).toBe(false);
    expect(text.safeParse('half \uD800').success).toBe(false);
    expect(hasControlCharacter('a\nb', { lines: true })).toBe(false);
    expect(hasControlCharacter('a\nb')).toBe(true);
  });
});

describe('every name field of the shared schemas follows the rule', () => {
  const cases = [
    { schema: signUpSchema, base: { name: 'Pat', email: 'pat@example.org', password: 'long-enough-pass' }, field: 'name' },
    { schema: studySchema, base: { name: 'Rain study', description: '' }, field: 'name' },
    { schema: studySchema, base: { name: 'Rain study', description: '' }, field: 'description' },
    { schema: apiKeyCreateSchema, base: { name: 'Survey', designVersionId: 1 }, field: 'name' },
    { schema: commentSchema, base: { text: 'fine' }, field: 'text' },
    {
      schema: priorSetSchema,
      base: { name: 'P', medianSmall: 0.1, medianLarge: 0.05, sdLogSmall: 1, sdLogLarge: 1, correlation: 0 },
      field: 'name',
    },
  ] as const;
  for (const { schema, base, field } of cases) {
    it(`bad input: a lone surrogate in ${field} is refused, naming the field`, () => {
      const result = (schema as unknown as { safeParse: (v: unknown) => { success: boolean; error?: { issues: Array<{ path: PropertyKey[] }> } } }).safeParse({
        ...base,
        [field]: 'Rainy \uD83C day',
      });
      expect(result.success).toBe(false);
      expect(result.error?.issues.map((i) => i.path.join('.'))).toEqual([field]);
    });
  }
});
