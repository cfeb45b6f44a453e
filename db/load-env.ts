import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { parseEnv } from 'node:util';

/**
 * Loads .env.local into process.env for scripts run outside Next (migrations, seeders), with Node's
 * own env-file parser. Variables already set in the environment win, as they do in Next.
 */
export function loadLocalEnv(file = path.join(process.cwd(), '.env.local')): void {
  if (!existsSync(file)) return;
  for (const [key, value] of Object.entries(parseEnv(readFileSync(file, 'utf8')))) {
    if (process.env[key] === undefined) process.env[key] = value;
  }
}
