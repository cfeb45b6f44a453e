import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { mailEnv } from '@/lib/server/env';

/** One message kept by the local test mail server, as the mailbox page shows it. */
export type MailboxMessage = { id: string; receivedAt: string; from: string; to: string; subject: string; text: string; recipients: string[] };

const MESSAGE_FILE = /^\d{8}T\d{9}Z-[0-9a-f]{8}\.eml$/;

// Kept files never change (the server writes each once, under a new name), so a parsed message can
// be reused by the mailbox page's polling instead of parsing every file on every refresh.
const parsedCache = new Map<string, MailboxMessage>();
const CACHE_LIMIT = 500;

/**
 * The folder the local test mail server writes to, or null when mail goes to a real server (then the
 * mailbox page and its link are hidden). Set by scripts/services.mjs as MAILBOX_DIR.
 */
export function mailboxDir(): string | null {
  const env = mailEnv();
  return env.SMTP_URL ? (env.MAILBOX_DIR ?? null) : null;
}

function addresses(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return '';
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(', ');
}

/** Every address a message went to (To, Cc, Bcc), lower-cased. */
function recipientsOf(...values: Array<AddressObject | AddressObject[] | undefined>): string[] {
  return values
    .flatMap((value) => (value ? (Array.isArray(value) ? value : [value]) : []))
    .flatMap((list) => list.value.map((entry) => entry.address?.toLowerCase() ?? ''))
    .filter(Boolean);
}

/** Parses one kept message; `id` is its file name. */
export async function readMessage(dir: string, id: string): Promise<MailboxMessage> {
  const parsed = await simpleParser(await readFile(path.join(dir, id)));
  const stamp = id.slice(0, 18);
  const received = `${stamp.slice(0, 4)}-${stamp.slice(4, 6)}-${stamp.slice(6, 8)}T${stamp.slice(9, 11)}:${stamp.slice(11, 13)}:${stamp.slice(13, 15)}.${stamp.slice(15, 18)}Z`;
  return {
    id,
    receivedAt: new Date(received).toISOString(),
    from: addresses(parsed.from),
    to: addresses(parsed.to),
    subject: parsed.subject ?? '(no subject)',
    text: (parsed.text ?? '').trim(),
    recipients: recipientsOf(parsed.to, parsed.cc, parsed.bcc),
  };
}

// How many of the newest files one listing reads at most while looking for a person's messages.
const SCAN_LIMIT = 2000;

async function cachedMessage(dir: string, id: string): Promise<MailboxMessage> {
  const key = path.join(dir, id);
  const cached = parsedCache.get(key);
  if (cached) return cached;
  const message = await readMessage(dir, id);
  if (parsedCache.size >= CACHE_LIMIT) parsedCache.delete(parsedCache.keys().next().value!);
  parsedCache.set(key, message);
  return message;
}

/**
 * The newest kept messages addressed to `recipient` first (at most `limit`), or every message when
 * `recipient` is null (for tests and tools, never for the page). Only complete files count: the
 * server writes under a temporary name and renames, so a message never appears half-written.
 */
export async function listMailbox(dir: string, options: { recipient: string | null; limit?: number }): Promise<MailboxMessage[]> {
  const limit = options.limit ?? 100;
  const recipient = options.recipient?.toLowerCase() ?? null;
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw error;
  }
  const newest = names.filter((n) => MESSAGE_FILE.test(n)).sort().reverse().slice(0, recipient ? SCAN_LIMIT : limit);
  const found: MailboxMessage[] = [];
  for (let start = 0; start < newest.length && found.length < limit; start += 50) {
    const batch = await Promise.all(newest.slice(start, start + 50).map((id) => cachedMessage(dir, id)));
    found.push(...batch.filter((m) => recipient === null || m.recipients.includes(recipient)));
  }
  return found.slice(0, limit);
}
