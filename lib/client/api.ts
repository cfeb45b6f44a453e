/** An error reply from Switchback's API, with its status and any field issues. */
export class ApiClientError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly issues: Array<{ path: string; message: string }> = [],
  ) {
    super(message);
    this.name = 'ApiClientError';
  }
}

/** fetch for our JSON API: throws ApiClientError for non-2xx replies, returns parsed JSON (or null for 204). */
export async function apiFetch<T>(url: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, headers, ...rest } = init;
  // Every write declares JSON, even without a body: the server refuses other types (cross-site protection).
  const writes = (rest.method ?? 'GET').toUpperCase() !== 'GET';
  let response: Response;
  try {
    response = await fetch(url, {
      ...rest,
      headers: { Accept: 'application/json', ...(json !== undefined || writes ? { 'Content-Type': 'application/json' } : {}), ...headers },
      body: json !== undefined ? JSON.stringify(json) : rest.body,
    });
  } catch {
    throw new ApiClientError(0, 'Switchback cannot be reached. Check your connection; we will keep trying.');
  }
  if (response.status === 204) return null as T;
  const body = await response.json().catch(() => null);
  if (!response.ok) {
    const message = body?.error ?? `Request failed (${response.status}).`;
    throw new ApiClientError(response.status, message === 'database unavailable' ? 'The database is unavailable right now; retrying automatically.' : message, body?.issues ?? []);
  }
  return body as T;
}

/** Retry transient faults (database down, network) patiently; never retry a client error. */
export function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiClientError && (error.status === 503 || error.status === 0)) return failureCount < 30;
  if (error instanceof ApiClientError && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}
