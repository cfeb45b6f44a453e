import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CRITERION_TERMS } from '@/components/planner/labels';
import { GLOSSARY, GLOSSARY_GROUPS, glossaryEntry } from '@/lib/shared/glossary';

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? sources(path) : /\.tsx?$/.test(name) ? [path] : [];
  });
}

describe('the glossary', () => {
  it('explains every term a new user tripped over, each with a formula or a source', () => {
    for (const id of ['gap-product', 'maximin-gap', 'patterns', 'far-near-view', 'standing-day', 'reversal-zone', 'anchor-clarity', 'calibration-block', 'estimate']) {
      const entry = glossaryEntry(id);
      expect(entry.short.length).toBeGreaterThan(20);
      expect(entry.sources.length).toBeGreaterThan(0);
    }
    expect(glossaryEntry('gap-product').formulas).toContain('C(D) = A(D) · B(D) on D_lower < D < D_upper');
    expect(glossaryEntry('reversal-zone').aliases).toEqual(expect.arrayContaining(['D_lower', 'D_upper']));
    for (const letters of ['LL', 'LS', 'SL', 'SS']) expect(glossaryEntry('patterns').body).toContain(`${letters}:`);
  });

  it('gives every entry a unique id, a known group and at least one source', () => {
    expect(new Set(GLOSSARY.map((e) => e.id)).size).toBe(GLOSSARY.length);
    for (const e of GLOSSARY) {
      expect(GLOSSARY_GROUPS).toContain(e.group);
      expect(e.sources.length, e.id).toBeGreaterThan(0);
    }
  });

  it('has an entry for every help button on the pages (a typo in an id fails here, not on a page)', () => {
    const used = sources('components')
      .flatMap((file) => [...readFileSync(file, 'utf8').matchAll(/<TermHelp id="([^"]+)"/g)].map((m) => m[1]))
      .concat(Object.values(CRITERION_TERMS));
    expect(used.length).toBeGreaterThan(10);
    for (const id of used) expect(() => glossaryEntry(id)).not.toThrow();
  });

  it('refuses an unknown id loudly', () => {
    expect(() => glossaryEntry('no-such-term')).toThrow(/no-such-term/);
  });
});
