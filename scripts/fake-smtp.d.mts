export type FakeSmtp = { port: number; url: string; mailboxDir: string; stop: () => Promise<void> };
export declare function startFakeSmtp(options: { port?: number; host?: string; mailboxDir: string }): Promise<FakeSmtp>;
