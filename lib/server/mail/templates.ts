import { formatDate, formatDateTime } from '@/lib/shared/format';
import { ROLE_LABELS, type Role } from '@/lib/shared/roles';
import type { MailMessage } from './transport';

const ROLE_DUTIES: Record<Role, string> = {
  viewer: 'read designs, power results and exports',
  operator: 'also export the frozen item bank for the lab',
  editor: 'also build, compare and freeze designs and run power simulations',
  owner: 'also manage the team and the study itself',
};

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}


/** Builds text and HTML from paragraphs, one of which may be a link (shown as a button in HTML). */
function compose(to: string, subject: string, parts: Array<string | { link: string; label: string }>): MailMessage {
  const text = parts.map((p) => (typeof p === 'string' ? p : `${p.label}:\n${p.link}`)).join('\n\n') + '\n\n\u2014 Switchback\n';
  const body = parts
    .map((p) =>
      typeof p === 'string'
        ? `<p>${escapeHtml(p)}</p>`
        : `<p><a href="${escapeHtml(p.link)}" style="display:inline-block;padding:8px 16px;background:#0f766e;color:#fff;border-radius:6px;text-decoration:none">${escapeHtml(p.label)}</a></p><p style="font-size:12px;color:#555">Or paste this address into your browser: ${escapeHtml(p.link)}</p>`,
    )
    .join('\n');
  const html = `<!doctype html><html><body style="font-family:sans-serif;line-height:1.5;color:#1f2933">${body}<p style="color:#555">\u2014 Switchback</p></body></html>`;
  return { to, subject, text, html };
}

/** The invitation to join a study: who invited, which role, the single-use link and its expiry. */
export function invitationMessage(input: { to: string; studyName: string; inviterName: string; role: Role; link: string; expiresAt: Date }): MailMessage {
  return compose(input.to, `Join \u201c${input.studyName}\u201d on Switchback`, [
    `${input.inviterName} invites you to join the study \u201c${input.studyName}\u201d on Switchback as ${ROLE_LABELS[input.role].toLowerCase()}. Once you accept, you can ${ROLE_DUTIES[input.role]}.`,
    { link: input.link, label: 'Open the invitation' },
    `The link works once and until ${formatDateTime(input.expiresAt)}. If you have no Switchback account yet, you can create one from that page with this address.`,
    'Not expecting this? Ignore this message; nothing happens unless the link is used.',
  ]);
}

/** The password-reset message with its single-use, short-lived link. */
export function passwordResetMessage(input: { to: string; link: string; expiresAt: Date }): MailMessage {
  return compose(input.to, 'Choose a new Switchback password', [
    'Someone (hopefully you) asked to choose a new password for the Switchback account of this address.',
    { link: input.link, label: 'Choose a new password' },
    `The link works once and until ${formatDateTime(input.expiresAt)}. If you did not ask for this, ignore this message: your password stays as it is.`,
  ]);
}

/** Notice to a team member who asked to hear about frozen designs. */
export function designFrozenMessage(input: { to: string; studyName: string; actorName: string; versionHash: string; link: string }): MailMessage {
  return compose(input.to, `A design was frozen in \u201c${input.studyName}\u201d`, [
    `${input.actorName} froze a design in \u201c${input.studyName}\u201d. Its content hash is ${input.versionHash.slice(0, 12)}\u2026; exports and power runs cite this version.`,
    { link: input.link, label: 'Open the designs' },
    'You get this notice because you turned it on in your account settings; you can turn it off there.',
  ]);
}

/** Notice to a team member who asked to hear about finished power runs. */
export function powerRunFinishedMessage(input: { to: string; studyName: string; runId: number; link: string }): MailMessage {
  return compose(input.to, `Power run #${input.runId} finished in \u201c${input.studyName}\u201d`, [
    `Power simulation run #${input.runId} of \u201c${input.studyName}\u201d has finished. Its results are estimates from simulated hypothetical choices.`,
    { link: input.link, label: 'Open the run' },
    'You get this notice because you turned it on in your account settings; you can turn it off there.',
  ]);
}

// account security: proof of an address, and the notice that replaces a second sign-up

/** The link that confirms a new account's address (single use, expiring). */
export function addressConfirmationMessage(input: { to: string; link: string; expiresAt: Date }): MailMessage {
  return compose(input.to, 'Confirm your e-mail address for Switchback', [
    'An account on Switchback was created with this address. Confirm that the address is yours; until then, invitations to studies cannot be accepted with it.',
    { link: input.link, label: 'Confirm my address' },
    `The link works once and until ${formatDateTime(input.expiresAt)}. If you did not create this account, ignore this message: the address stays unconfirmed.`,
  ]);
}

/** Sent instead of a confirmation when someone signs up with an address that already has an account. */
export function accountExistsMessage(input: { to: string; signInLink: string; resetLink: string }): MailMessage {
  return compose(input.to, 'Someone tried to create a Switchback account with your address', [
    'Someone asked to create a Switchback account with this address, which already has one, so no new account was made and nothing changed.',
    { link: input.signInLink, label: 'Sign in' },
    { link: input.resetLink, label: 'Forgot your password? Choose a new one' },
    'If it was not you, you can ignore this message.',
  ]);
}

/** One payout in the operators' daily summary. */
export type PayoutSummaryLine = { participantId: string; amount: string; dueDate: string; note: string };

/** The operators' daily payout summary of one study: what was sent, what failed, what is still held. */
export function payoutSummaryMessage(input: { to: string; studyName: string; day: string; sent: PayoutSummaryLine[]; failed: PayoutSummaryLine[]; held: PayoutSummaryLine[]; link: string }): MailMessage {
  const list = (title: string, lines: PayoutSummaryLine[]) =>
    lines.length === 0 ? `${title}: none.` : `${title} (${lines.length}):\n${lines.map((l) => `\u2022 ${l.participantId}: ${l.amount}, due ${formatDate(l.dueDate)}${l.note ? ` \u2014 ${l.note}` : ''}`).join('\n')}`;
  return compose(input.to, `Payouts of \u201c${input.studyName}\u201d on ${formatDate(input.day)}: ${input.sent.length} sent, ${input.failed.length} failed`, [
    `The payout summary of \u201c${input.studyName}\u201d for ${formatDate(input.day)} (UTC).`,
    list('Sent', input.sent),
    list('Failed or waiting for a retry', input.failed),
    list('Held (no payment details, or waiting for an owner\u2019s approval)', input.held),
    { link: input.link, label: 'Open the payout ledger' },
    'Real rewards follow the rules your ethics board approved for payments to participants.',
  ]);
}
