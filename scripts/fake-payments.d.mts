export declare const FAKE_PAYMENT_TOKEN: string;
export type FakePayments = {
  port: number;
  url: string;
  basePath: string;
  token: string;
  orders: () => Array<{ id: string; external_id: string | null; rewards: Array<{ value: { denomination: number; currency_code: string }; recipient: { name: string; email: string } }> }>;
  /** how many order requests carried this external id (refused ones included) */
  requests: (externalId: string) => number;
  failNext: (options: { count: number; status?: number; after?: boolean }) => void;
  reset: () => void;
  stop: () => Promise<void>;
};
export declare function startFakePayments(options?: { port?: number; host?: string; token?: string }): Promise<FakePayments>;
export declare function orderProblems(body: unknown): Record<string, string[]> | null;
