import { z } from 'zod';

// Server-side settings, parsed once with zod so a missing or malformed one fails loudly with its
// name instead of surfacing later as a confusing connection error.
const serverEnvSchema = z.object({
  DB_HOST: z.string().min(1).default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_NAME: z.string().min(1),
  DB_USER: z.string().min(1),
  DB_PASSWORD: z.string().min(1),
  NEXTAUTH_SECRET: z.string().min(16, 'NEXTAUTH_SECRET must be at least 16 characters'),
  NEXTAUTH_URL: z.url().optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Switchback <no-reply@switchback.local>'),
  // account security: the reverse proxies whose X-Forwarded-For is believed (addresses or CIDR
  // ranges, comma-separated). Empty: rate limits count the address of the connection itself.
  TRUSTED_PROXIES: z
    .string()
    .default('')
    .transform((list) => list.split(',').map((entry) => entry.trim()).filter(Boolean))
    .pipe(z.array(z.union([z.ipv4(), z.ipv6(), z.cidrv4(), z.cidrv6()], { error: 'list IP addresses or CIDR ranges, separated by commas' }))),
});

export type ServerEnv = z.infer<typeof serverEnvSchema>;

let cached: ServerEnv | undefined;

/** The parsed server environment; throws naming every missing or invalid variable. */
export function serverEnv(): ServerEnv {
  if (cached) return cached;
  const parsed = serverEnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Switchback configuration is incomplete: ${problems}. Run "npm start", which writes .env.local.`);
  }
  cached = parsed.data;
  return cached;
}
