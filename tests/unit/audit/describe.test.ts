import { describe, expect, it } from 'vitest';
import { describeEvent, sentenceText } from '@/components/audit/describe';
import type { AuditNamesDto } from '@/lib/client/team';

const names: AuditNamesDto = {
  designs: { '7': 'Personalised, two-week soon delay' },
  versions: { '12': { designId: 7, designName: 'Personalised, two-week soon delay', number: 2 } },
  priors: { '3': 'Harbourlight pilot' },
  users: { '5': 'Vesper Viewer' },
};

describe('audit details as sentences', () => {
  it('names a frozen design and links to it instead of showing its database id', () => {
    const parts = describeEvent({ action: 'design.freeze', details: { designId: 7, versionId: 12, number: 2, hash: 'ab'.repeat(32) } }, names, 4);
    expect(sentenceText(parts)).toBe('Froze “Personalised, two-week soon delay” as version 2 (SHA-256 abababababab…).');
    expect(parts).toContainEqual({ text: '“Personalised, two-week soon delay”', href: '/studies/4/designs/7' });
  });

  it('names the design and version number an API key or an export is for', () => {
    const key = describeEvent({ action: 'api-key.create', details: { keyId: 9, name: 'lab tablet', prefix: 'sbk_ab12', designVersionId: 12 } }, names, 4);
    expect(sentenceText(key)).toBe('Issued the API key “lab tablet” (sbk_ab12…) for “Personalised, two-week soon delay” version 2.');
    const exported = describeEvent({ action: 'item-bank.export', details: { designVersionId: 12, hash: 'x', seed: 42, format: 'csv' } }, names, 4);
    expect(sentenceText(exported)).toBe('Exported the item bank of “Personalised, two-week soon delay” version 2 as CSV, seed 42.');
  });

  it('writes a role change with the person’s name, e-mail and role words', () => {
    const parts = describeEvent({ action: 'member.role-change', details: { userId: 5, email: 'vesper.viewer@example.org', from: 'viewer', to: 'operator' } }, names, 4);
    expect(sentenceText(parts)).toBe('Changed the role of Vesper Viewer (vesper.viewer@example.org) from viewer to operator.');
  });

  it('keeps the recorded name, without a link, for something deleted since', () => {
    const parts = describeEvent({ action: 'design.create', details: { designId: 99, name: 'Old draft' } }, names, 4);
    expect(parts).toEqual(['Created the design ', '“Old draft”', '.']);
  });

  it('has no raw key=value dump and no bare id for any action the services record', () => {
    const actions = ['study.create', 'study.update', 'invitation.create', 'invitation.accept', 'member.remove', 'prior.create', 'prior.update', 'design.update', 'design.delete', 'api-key.revoke', 'power-run.start', 'power-run.cancel', 'power-run.restart', 'audit.export'];
    for (const action of actions) {
      const text = sentenceText(describeEvent({ action, details: { designId: 7, priorId: 3, runId: 8, designVersionId: 12, name: 'n', email: 'e@example.org', role: 'editor', version: 3, rows: 4, completed: 5, replications: 1000, prefix: 'sbk_1' } }, names, 4));
      expect(text, action).not.toMatch(/[a-zA-Z]+Id\b|=|: \d/);
      expect(text, action).toMatch(/\.$/);
    }
  });
});
