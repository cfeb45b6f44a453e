import { describe, expect, it } from 'vitest';
import { orderProblems } from '@/scripts/fake-payments.mjs';
import { retryDelayMs } from '@/lib/server/services/payouts-scheduler';

// The local fake of the payment provider checks orders the way the service documents them
// (single-reward order: funding source, campaign or products, value, recipient, delivery method).
const good = {
  external_id: '2f0c2a4e-1111-4222-8333-444455556666',
  payment: { funding_source_id: 'balance' },
  reward: { campaign_id: 'CAMPAIGN1', value: { denomination: 37.5, currency_code: 'EUR' }, recipient: { name: 'Study participant', email: 'p@example.test' }, delivery: { method: 'EMAIL' } },
};
const withReward = (reward: Record<string, unknown>) => ({ ...good, reward: { ...good.reward, ...reward } });

describe('the fake payment API checks orders like the service', () => {
  it('accepts a complete single-reward order', () => {
    expect(orderProblems(good)).toBeNull();
    expect(orderProblems(withReward({ campaign_id: undefined, products: ['P1'] }))).toBeNull();
    expect(orderProblems(withReward({ value: { denomination: 500, currency_code: 'JPY' } }))).toBeNull();
  });
  it.each([
    ['reward', withReward({ campaign_id: undefined })],
    ['reward.value.denomination', withReward({ value: { denomination: 0, currency_code: 'EUR' } })],
    ['reward.value.denomination', withReward({ value: { denomination: 37.505, currency_code: 'EUR' } })],
    ['reward.value.denomination', withReward({ value: { denomination: 10.5, currency_code: 'JPY' } })],
    ['reward.value.currency_code', withReward({ value: { denomination: 1, currency_code: 'euro' } })],
    ['reward.recipient.email', withReward({ recipient: { name: 'x', email: 'nope' } })],
    ['reward.recipient.name', withReward({ recipient: { name: ' ', email: 'p@example.test' } })],
    ['reward.delivery.method', withReward({ delivery: { method: 'PIGEON' } })],
    ['payment.funding_source_id', { ...good, payment: {} }],
    ['external_id', { ...good, external_id: 'x'.repeat(65) }],
  ])('bad input: refuses an order, naming %s', (field, order) => {
    expect(Object.keys(orderProblems(order) ?? {})).toContain(field);
  });
});

describe('retry back-off', () => {
  it('waits the base delay after the first failure and doubles it after each further one', () => {
    expect([1, 2, 3, 4].map((n) => retryDelayMs(n, 15) / 60_000)).toEqual([15, 30, 60, 120]);
  });
});
