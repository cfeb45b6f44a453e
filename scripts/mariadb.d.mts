export type DatabaseEnv = { DB_HOST: string; DB_PORT: string; DB_NAME: string; DB_USER: string; DB_PASSWORD: string; DB_SOCKET?: string };
export declare function startDatabase(options?: { instance?: 'app' | 'test'; fresh?: boolean; log?: (...args: unknown[]) => void }): Promise<DatabaseEnv>;
export declare function stopDatabase(options?: { instance?: 'app' | 'test'; log?: (...args: unknown[]) => void }): Promise<void>;
export declare function readEnvFile(file: string): Record<string, string>;
