// The starter experiment words options exactly as the item bank does (its own copy of the wording
// runs in the lab's page), and its HTML cannot be broken out of by a study's name.
import { describe, expect, it } from 'vitest';
import { amountText, delayText } from '@/lib/design';
import { starterRuntime, type StarterConfig } from '@/lib/shared/starter-runtime';
import { starterHtml } from '@/lib/server/services/starter';

const helpers = starterRuntime({} as StarterConfig, { helpersOnly: true }) as { delayText: typeof delayText; amountText: typeof amountText };

describe('the starter experiment', () => {
  it('words every delay from 0 to 800 days as the item bank does, in days, weeks and months', () => {
    for (const unit of ['days', 'weeks', 'months'] as const) {
      for (let days = 0; days <= 800; days++) expect(helpers.delayText(days, unit), `${days} ${unit}`).toBe(delayText(days, unit));
    }
  });

  it('words amounts as the item bank does, whole and with cents, in several currencies', () => {
    for (const currency of ['EUR', 'USD', 'GBP', 'JPY', 'CHF', 'XYZ']) {
      for (const amount of [0.5, 1, 12.25, 37.5, 100, 1250]) expect(helpers.amountText(amount, currency), `${amount} ${currency}`).toBe(amountText(amount, currency));
    }
  });

  it('keeps a study name with markup inside the page as text', () => {
    const content = { spec: { currency: 'EUR' } } as never;
    const html = starterHtml({ study: { id: 7, name: '</script><script>alert(1)</script>' }, version: { id: 3, number: 1, hash: 'a'.repeat(64), content }, apiBase: 'http://127.0.0.1:3000' });
    expect(html.match(/<\/script>/g)).toHaveLength(1);
    expect(html).toContain('<title>&lt;/script&gt;');
    expect(html).toContain('PASTE-YOUR-BROWSER-KEY-HERE');
    expect(html).toContain('"studyId": 7');
  });
});
