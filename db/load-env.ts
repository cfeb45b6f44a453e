import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';

/**
 * Loads KEY=VALUE lines from .env.local into process.env for scripts run outside Next
 * (migrations, seeders). Variables already set in the environment win, as they do in Next.
 */
export function loadLocalEnv(file = path.join(process.cwd(), '.env.local')): void {
  if (!existsSync(file)) return;
  for (const line of readFileSync(file, 'utf8').split('\n')) {
    const match = /^\s*([A-Z0-9_]+)\s*=\s*(.*)\s*$/.exec(line);
    if (!match) continue;
    const [, key, raw] = match;
    if (process.env[key] === undefined) process.env[key] = raw.replace(/^"(.*)"$/, '$1');
  }
}
