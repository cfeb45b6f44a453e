import { Configuration, OrdersApi, type ListRewards200ResponseRewardsInnerValueCurrencyCodeEnum as CurrencyCode } from 'tremendous';
import { formatMinorUnits } from '@/lib/design';
import { paymentEnv } from '@/lib/server/env';

/** What the provider did with one payout: its order id, and whether it was an order it already had (same idempotency key). */
export type ProviderOrder = { reference: string; replayed: boolean; status: string };

/** A refused or failed payment call. `retryable`: worth another attempt later (no answer, 5xx, 408, 409, 429). */
export class PaymentProviderError extends Error {
  readonly retryable: boolean;
  readonly status: number | null;

  constructor(message: string, options: { retryable: boolean; status: number | null }) {
    super(message);
    this.name = 'PaymentProviderError';
    this.retryable = options.retryable;
    this.status = options.status;
  }
}

/** What a payout needs from the provider: a reward link by e-mail for the amount, once per idempotency key. */
export type RewardOrder = { idempotencyKey: string; amountMinor: number; currency: string; email: string; dueDate: string };

const clients = new Map<string, OrdersApi>();

function ordersApi(): { api: OrdersApi; fundingSource: string; campaignId: string | null } {
  const env = paymentEnv();
  if (!env.PAYMENT_API_URL || !env.PAYMENT_API_TOKEN) {
    throw new PaymentProviderError('The payment service is not configured (PAYMENT_API_URL and PAYMENT_API_TOKEN); payouts wait until it is.', { retryable: true, status: null });
  }
  const cacheKey = `${env.PAYMENT_API_URL} ${env.PAYMENT_API_TOKEN}`;
  let api = clients.get(cacheKey);
  if (!api) {
    // The SDK's own base-path option: the local fake in development and tests, the real service otherwise.
    api = new OrdersApi(new Configuration({ basePath: env.PAYMENT_API_URL, accessToken: env.PAYMENT_API_TOKEN, baseOptions: { timeout: 15_000 } }));
    clients.set(cacheKey, api);
  }
  return { api, fundingSource: env.PAYMENT_FUNDING_SOURCE, campaignId: env.PAYMENT_CAMPAIGN_ID ?? null };
}

type AxiosLike = { response?: { status?: number; data?: { errors?: { message?: string; payload?: unknown } } }; code?: string; message?: string };

function providerError(error: unknown): PaymentProviderError {
  const e = error as AxiosLike;
  const status = e.response?.status ?? null;
  if (status === null) return new PaymentProviderError(`The payment service did not answer (${e.code ?? e.message ?? 'no reply'}).`, { retryable: true, status: null });
  const detail = e.response?.data?.errors;
  const payload = detail?.payload && typeof detail.payload === 'object' && Object.keys(detail.payload).length ? ` ${JSON.stringify(detail.payload)}` : '';
  const retryable = status >= 500 || status === 408 || status === 409 || status === 429;
  return new PaymentProviderError(`The payment service answered ${status}: ${detail?.message ?? 'no message'}${payload}`.slice(0, 480), { retryable, status });
}

/**
 * Orders one reward through the provider's SDK. The payout's idempotency key is the order's
 * external id: the provider answers a repeated key with the first order (201) and creates
 * nothing, so a retry after a lost reply never pays twice. The amount leaves Switchback as the
 * exact decimal text of its minor units, parsed once into the number the API takes.
 *
 * @throws PaymentProviderError (retryable or not) when the call fails
 */
export async function orderReward(order: RewardOrder): Promise<ProviderOrder> {
  const { api, fundingSource, campaignId } = ordersApi();
  try {
    const response = await api.createOrder({
      external_id: order.idempotencyKey,
      payment: { funding_source_id: fundingSource },
      reward: {
        ...(campaignId ? { campaign_id: campaignId } : { products: ['local-reward-link'] }),
        value: { denomination: Number(formatMinorUnits({ minor: order.amountMinor, currency: order.currency })), currency_code: order.currency as CurrencyCode },
        recipient: { name: 'Study participant', email: order.email },
        delivery: { method: 'EMAIL' },
      },
    });
    return { reference: response.data.order.id, replayed: response.status === 201, status: response.data.order.status };
  } catch (error) {
    throw providerError(error);
  }
}
