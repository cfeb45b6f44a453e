// A local stand-in for the payment provider's REST API (the part Switchback's SDK calls use):
// POST /api/v2/orders and GET /api/v2/orders/{id}, with the provider's request checks, its
// idempotency (an order's external_id answers the first order again, status 201, and creates
// nothing), and its error shape ({ errors: { message, payload } }). Orders live in memory.
//
// Tests steer it through /__fake/*: POST /__fake/fail { count, status, after } makes the next
// `count` order calls fail with `status` (after: true creates the order first and loses the
// reply, as a dropped connection would), GET /__fake/orders lists what was created, POST
// /__fake/reset forgets everything.
//
//   node scripts/fake-payments.mjs [--port 4079]             run on its own
//   import { startFakePayments } from './fake-payments.mjs'   start in-process (tests, services)
import { randomBytes } from 'node:crypto';
import http from 'node:http';
import { pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';

export const FAKE_PAYMENT_TOKEN = 'fake-payment-token-local';
const MAX_BODY = 64 * 1024;
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;
const METHODS = ['EMAIL', 'LINK', 'PHONE'];

const id = () => randomBytes(6).toString('hex').toUpperCase();

function send(res, status, body) {
  const text = JSON.stringify(body);
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}

const problem = (res, status, message, payload = {}) => send(res, status, { errors: { message, payload } });

function currencyDigits(code) {
  if (typeof code !== 'string' || !/^[A-Z]{3}$/.test(code)) return null;
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return null;
  }
}

/** The provider's checks of a single-reward order: every problem named under its field. */
export function orderProblems(body) {
  const issues = {};
  const add = (field, message) => (issues[field] ??= []).push(message);
  if (!body || typeof body !== 'object' || Array.isArray(body)) return { body: ['must be a JSON object'] };
  if (body.external_id !== undefined && body.external_id !== null && (typeof body.external_id !== 'string' || body.external_id.length > 64)) add('external_id', 'must be a string of at most 64 characters');
  if (typeof body.payment?.funding_source_id !== 'string' || !body.payment.funding_source_id) add('payment.funding_source_id', 'is required');
  const reward = body.reward;
  if (!reward || typeof reward !== 'object') {
    add('reward', 'is required');
    return issues;
  }
  const hasProducts = Array.isArray(reward.products) && reward.products.length > 0;
  if (!reward.campaign_id && !hasProducts) add('reward', 'either products or campaign_id must be specified');
  const value = reward.value;
  if (typeof value?.denomination !== 'number' || !Number.isFinite(value.denomination) || value.denomination <= 0) add('reward.value.denomination', 'must be a positive number');
  const digits = currencyDigits(value?.currency_code);
  if (digits === null) add('reward.value.currency_code', 'must be an ISO 4217 code');
  else if (typeof value.denomination === 'number' && Number(value.denomination.toFixed(digits)) !== value.denomination) add('reward.value.denomination', `has more than ${digits} decimals`);
  if (typeof reward.recipient?.name !== 'string' || !reward.recipient.name.trim()) add('reward.recipient.name', 'is required');
  if (typeof reward.recipient?.email !== 'string' || !EMAIL.test(reward.recipient.email)) add('reward.recipient.email', 'must be a valid e-mail address');
  if (!METHODS.includes(reward.delivery?.method)) add('reward.delivery.method', `must be one of ${METHODS.join(', ')}`);
  if (reward.deliver_at !== undefined && !/^\d{4}-\d{2}-\d{2}/.test(String(reward.deliver_at))) add('reward.deliver_at', 'must be a date');
  return Object.keys(issues).length ? issues : null;
}

function readBody(req) {
  return new Promise((resolve, reject) => {
    const chunks = [];
    let size = 0;
    req.on('data', (c) => {
      size += c.length;
      if (size > MAX_BODY) {
        reject(Object.assign(new Error('too large'), { status: 413 }));
        req.destroy();
      } else chunks.push(c);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

/**
 * Starts the fake payment API on `host:port` (port 0 picks a free one). The SDK's base path is
 * `${url}/api/v2`; the bearer token it accepts is FAKE_PAYMENT_TOKEN.
 * @returns {Promise<{ port: number, url: string, basePath: string, token: string, orders: () => object[], failNext: (o: { count: number, status?: number, after?: boolean }) => void, reset: () => void, stop: () => Promise<void> }>}
 */
export async function startFakePayments({ port = 4079, host = '127.0.0.1', token = FAKE_PAYMENT_TOKEN } = {}) {
  const orders = new Map();
  const byExternalId = new Map();
  let failure = { count: 0, status: 503, after: false };
  const calls = { orders: 0 };
  /** external ids of every order request that reached the provider, refused ones included */
  const received = [];

  function createOrder(body) {
    const now = new Date().toISOString();
    const orderId = id();
    const order = {
      id: orderId,
      external_id: body.external_id ?? null,
      campaign_id: body.reward.campaign_id ?? null,
      created_at: now,
      status: 'EXECUTED',
      channel: 'API',
      payment: { subtotal: body.reward.value.denomination, total: body.reward.value.denomination, fees: 0 },
      rewards: [
        {
          id: id(),
          order_id: orderId,
          created_at: now,
          value: { denomination: body.reward.value.denomination, currency_code: body.reward.value.currency_code },
          recipient: { name: body.reward.recipient.name, email: body.reward.recipient.email },
          deliver_at: body.reward.deliver_at ?? now.slice(0, 10),
          delivery: { method: body.reward.delivery.method, status: 'SCHEDULED' },
        },
      ],
    };
    orders.set(orderId, order);
    if (order.external_id) byExternalId.set(order.external_id, order);
    return order;
  }

  async function handle(req, res) {
    const url = new URL(req.url ?? '/', 'http://fake');
    if (url.pathname === '/__fake/orders' && req.method === 'GET') return send(res, 200, { orders: [...orders.values()], calls: calls.orders });
    if (url.pathname === '/__fake/reset' && req.method === 'POST') {
      orders.clear();
      byExternalId.clear();
      failure = { count: 0, status: 503, after: false };
      calls.orders = 0;
      received.length = 0;
      return send(res, 200, { ok: true });
    }
    if (url.pathname === '/__fake/fail' && req.method === 'POST') {
      const body = JSON.parse((await readBody(req)) || '{}');
      failure = { count: Number(body.count ?? 1), status: Number(body.status ?? 503), after: Boolean(body.after) };
      return send(res, 200, failure);
    }
    if (!url.pathname.startsWith('/api/v2/')) return problem(res, 404, 'Not found');
    if (req.headers.authorization !== `Bearer ${token}`) return problem(res, 401, 'Unauthorized: check the access token');

    const orderMatch = /^\/api\/v2\/orders\/([^/]+)$/.exec(url.pathname);
    if (url.pathname === '/api/v2/orders' && req.method === 'POST') {
      calls.orders += 1;
      if (!String(req.headers['content-type'] ?? '').includes('application/json')) return problem(res, 415, 'Send JSON');
      let body;
      try {
        body = JSON.parse(await readBody(req));
      } catch (error) {
        return problem(res, error.status ?? 400, 'The request body is not valid JSON');
      }
      if (typeof body?.external_id === 'string') received.push(body.external_id);
      const failing = failure.count > 0;
      if (failing) failure.count -= 1;
      if (failing && !failure.after) return problem(res, failure.status, `The service is unavailable (fake failure, ${failure.status})`);
      const issues = orderProblems(body);
      if (issues) return problem(res, 400, 'Invalid order', issues);
      const existing = body.external_id ? byExternalId.get(body.external_id) : undefined;
      const order = existing ?? createOrder(body);
      if (failing) return problem(res, failure.status, `The service failed after accepting the order (fake failure, ${failure.status})`);
      return send(res, existing ? 201 : 200, { order });
    }
    if (orderMatch && req.method === 'GET') {
      const order = orders.get(orderMatch[1]) ?? byExternalId.get(decodeURIComponent(orderMatch[1]));
      return order ? send(res, 200, { order }) : problem(res, 404, 'Order not found');
    }
    return problem(res, 404, 'Not found');
  }

  const server = http.createServer((req, res) => {
    handle(req, res).catch((error) => problem(res, 500, error instanceof Error ? error.message : 'fake failure'));
  });
  await new Promise((resolve, reject) => {
    const onError = (error) =>
      reject(error.code === 'EADDRINUSE' ? new Error(`port ${port} on ${host} is in use; choose another with FAKE_PAYMENT_PORT, or set PAYMENT_API_URL to the real service`) : error);
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      resolve();
    });
  });
  const actualPort = server.address().port;
  const url = `http://${host}:${actualPort}`;
  return {
    port: actualPort,
    url,
    basePath: `${url}/api/v2`,
    token,
    orders: () => [...orders.values()],
    requests: (externalId) => received.filter((id) => id === externalId).length,
    failNext: ({ count, status = 503, after = false }) => {
      failure = { count, status, after };
    },
    reset: () => {
      orders.clear();
      byExternalId.clear();
      failure = { count: 0, status: 503, after: false };
      calls.orders = 0;
      received.length = 0;
    },
    stop: () =>
      new Promise((resolve) => {
        server.closeAllConnections?.();
        server.close(() => resolve());
      }),
  };
}

const isMain = process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url;
if (isMain) {
  const { values } = parseArgs({ options: { port: { type: 'string', default: process.env.FAKE_PAYMENT_PORT || '4079' } } });
  const started = await startFakePayments({ port: Number(values.port) });
  console.log(`Local fake payment API on ${started.basePath} (token ${started.token})`);
  const stop = async () => {
    await started.stop();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
