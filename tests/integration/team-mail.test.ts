// The local fake SMTP server itself, over real SMTP on loopback: what nodemailer sends arrives as
// an .eml file the mailbox page can read; half-written files never show; oversized mail is refused.
import { readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listMailbox, mailboxDir } from '@/lib/server/mail/mailbox';
import { sendMail, MailNotConfiguredError } from '@/lib/server/mail/transport';
import { startTestMailbox, type TestMailbox } from '../support/mail';

// The one test mailbox (tests/support/mail.ts): the fake server on a free port, its own folder,
// SMTP_URL and MAILBOX_DIR pointed at it and restored afterwards.
let mailbox: TestMailbox;
let smtp: { url: string };
let dir: string;

beforeAll(async () => {
  mailbox = await startTestMailbox();
  smtp = { url: mailbox.url };
  dir = mailbox.dir;
});
afterAll(async () => {
  await mailbox.stop();
});

describe('the fake SMTP server', () => {
  it('keeps what the app sends, readable with sender, recipient, subject and text', async () => {
    process.env.SMTP_URL = smtp.url;
    process.env.MAIL_FROM = 'Switchback test <tests@switchback.local>';
    await sendMail({ to: 'reader@example.org', subject: 'Übersicht “quoted”', text: 'Line one\nhttp://127.0.0.1:3000/x', html: '<p>Line one</p>' });
    delete process.env.MAIL_FROM;
    const [message] = await listMailbox(dir, { recipient: null });
    expect(message).toMatchObject({ to: 'reader@example.org', subject: 'Übersicht “quoted”', text: 'Line one\nhttp://127.0.0.1:3000/x' });
    expect(message.from).toContain('tests@switchback.local');
    expect(message.id).toMatch(/^\d{8}T\d{9}Z-[0-9a-f]{8}\.eml$/);
    expect(Math.abs(Date.parse(message.receivedAt) - Date.now())).toBeLessThan(60_000);
  });

  it('accepts any credentials, so an SMTP_URL with a user name works against it', async () => {
    const transport = nodemailer.createTransport(smtp.url.replace('smtp://', 'smtp://someone:secret@'));
    await transport.sendMail({ from: 'a@example.org', to: 'authenticated@example.org', subject: 'with auth', text: 'ok' });
    expect((await listMailbox(dir, { recipient: null })).some((m) => m.to === 'authenticated@example.org')).toBe(true);
  });

  it('refuses a message over 5 MB and keeps nothing of it', async () => {
    const before = (await readdir(dir)).length;
    const transport = nodemailer.createTransport(smtp.url);
    await expect(transport.sendMail({ from: 'a@example.org', to: 'big@example.org', subject: 'big', text: 'x'.repeat(6 * 1024 * 1024) })).rejects.toThrow(/552|larger/);
    expect((await readdir(dir)).length).toBe(before);
  });

  it('lists only complete messages, newest first', async () => {
    await writeFile(path.join(dir, '.incoming-20990101T000000000Z-00000000.eml'), 'Subject: half\r\n');
    const messages = await listMailbox(dir, { recipient: null });
    expect(messages.some((m) => m.subject === 'half')).toBe(false);
    const times = messages.map((m) => m.receivedAt);
    expect([...times].sort().reverse()).toEqual(times);
  });
});

describe('mail settings', () => {
  it('refuse to send without SMTP_URL, with a message naming the setting', async () => {
    delete process.env.SMTP_URL;
    await expect(sendMail({ to: 'x@example.org', subject: 's', text: 't', html: 'h' })).rejects.toBeInstanceOf(MailNotConfiguredError);
    await expect(sendMail({ to: 'x@example.org', subject: 's', text: 't', html: 'h' })).rejects.toThrow(/SMTP_URL/);
  });

  it('show the mailbox only while the fake server is in use', () => {
    process.env.MAILBOX_DIR = dir;
    delete process.env.SMTP_URL;
    expect(mailboxDir()).toBeNull();
    process.env.SMTP_URL = smtp.url;
    expect(mailboxDir()).toBe(dir);
    delete process.env.MAILBOX_DIR; // a real SMTP_URL alone: no mailbox
    expect(mailboxDir()).toBeNull();
  });
});
