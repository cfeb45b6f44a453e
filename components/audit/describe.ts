import type { AuditEventDto, AuditNamesDto } from '@/lib/client/team';
import { ROLE_LABELS, type Role } from '@/lib/shared/roles';

const LABELS: Record<string, string> = {
  'study.create': 'Study created',
  'study.update': 'Study renamed or described',
  'study.delete': 'Study deleted',
  'invitation.create': 'Invitation sent',
  'invitation.resend': 'Invitation sent again',
  'invitation.revoke': 'Invitation withdrawn',
  'invitation.accept': 'Invitation accepted',
  'member.role-change': 'Role changed',
  'member.remove': 'Member removed',
  'member.leave': 'Member left',
  'audit.export': 'Audit trail exported',
  'prior.create': 'Prior set created',
  'prior.update': 'Prior set changed',
  'prior.delete': 'Prior set deleted',
  'design.create': 'Design created',
  'design.update': 'Design changed',
  'design.delete': 'Design deleted',
  'design.freeze': 'Design frozen',
  'item-bank.export': 'Item bank exported',
  'api-key.create': 'API key issued',
  'api-key.revoke': 'API key revoked',
  'power-run.start': 'Power run started',
  'power-run.cancel': 'Power run cancelled',
  'power-run.restart': 'Power run restarted',
  // session page (issue 13)
  'session-link.create': 'Participant link created',
  'session-link.status': 'Participant link opened, paused or closed',
  // real rewards
  'rewards.settings': 'Real-reward settings changed',
  'payouts.approve': 'Payouts approved',
  'payouts.cancel': 'Payouts cancelled',
};

/** A readable label for an audit action; actions of other features show as written (e.g. "design.freeze"). */
export function describeAction(action: string): string {
  return LABELS[action] ?? action;
}

/** A piece of an event's sentence: plain text, or a name linking to the page of the thing it names. */
export type SentencePart = string | { text: string; href: string };

/** The plain text of a sentence (for filtering and for screen-reader-free contexts). */
export function sentenceText(parts: SentencePart[]): string {
  return parts.map((p) => (typeof p === 'string' ? p : p.text)).join('');
}

const quote = (name: string) => `“${name}”`;

/** Batch totals per currency, as recorded (", EUR 12.50"). */
const totals = (value: unknown) =>
  value && typeof value === 'object' ? Object.entries(value as Record<string, unknown>).map(([currency, amount]) => `, ${currency} ${String(amount)}`).join('') : '';

/**
 * What an audit event did, as a sentence with names and links instead of database ids: the
 * design, frozen version, prior set or person it concerns, under their current names (a thing
 * deleted since keeps the name the event recorded, without a link).
 */
export function describeEvent(event: Pick<AuditEventDto, 'action' | 'details'>, names: AuditNamesDto, studyId: number): SentencePart[] {
  const d = event.details;
  const str = (key: string) => (typeof d[key] === 'string' ? (d[key] as string) : undefined);
  const num = (key: string) => (typeof d[key] === 'number' ? (d[key] as number) : undefined);
  const base = `/studies/${studyId}`;
  const role = (key: string) => {
    const r = str(key);
    return r && r in ROLE_LABELS ? ROLE_LABELS[r as Role].toLowerCase() : r ?? 'a role';
  };
  const design = (idKey = 'designId', fallback = str('name')): SentencePart => {
    const id = num(idKey);
    const name = id !== undefined ? names.designs[String(id)] : undefined;
    if (id !== undefined && name) return { text: quote(name), href: `${base}/designs/${id}` };
    return fallback ? quote(fallback) : 'a design since deleted';
  };
  const version = (idKey = 'designVersionId'): SentencePart[] => {
    const id = num(idKey);
    const v = id !== undefined ? names.versions[String(id)] : undefined;
    if (!v) return ['a frozen version since deleted'];
    return [{ text: `${quote(v.designName)} version ${v.number}`, href: `${base}/designs/${v.designId}` }];
  };
  const prior = (): SentencePart => {
    const id = num('priorId');
    const name = id !== undefined ? names.priors[String(id)] : undefined;
    if (name) return { text: quote(name), href: `${base}/priors` };
    return str('name') ? quote(str('name')!) : 'a prior set since deleted';
  };
  const person = (): string => {
    const id = num('userId');
    const name = id !== undefined ? names.users[String(id)] : undefined;
    const email = str('email');
    return name && email && name !== email ? `${name} (${email})` : (name ?? email ?? 'a removed account');
  };
  const run = (): SentencePart => {
    const id = num('runId');
    return id !== undefined ? { text: `power run ${id}`, href: `${base}/power/${id}` } : 'a power run';
  };
  const changes = () =>
    (['name', 'description'] as const)
      .filter((key) => typeof d[key] === 'string')
      .map((key) => `${key} to ${quote(String(d[key]))}`)
      .join(' and ');

  switch (event.action) {
    case 'study.create':
      return [`Created the study ${quote(str('name') ?? '')}.`];
    case 'study.update':
      return [`Changed the study’s ${changes() || 'details'}.`];
    case 'study.delete':
      return [`Deleted the study ${quote(str('name') ?? '')}.`];
    case 'invitation.create':
      return [`Invited ${str('email') ?? 'someone'} as ${role('role')}.`];
    case 'invitation.resend':
      return [`Sent the invitation to ${str('email') ?? 'someone'} (${role('role')}) again.`];
    case 'invitation.revoke':
      return [`Withdrew the invitation to ${str('email') ?? 'someone'} (${role('role')}).`];
    case 'invitation.accept':
      return [d.alreadyMember ? `Accepted the invitation sent to ${str('email') ?? 'them'} while already a member (stays ${role('role')}).` : `Accepted the invitation sent to ${str('email') ?? 'them'} and joined as ${role('role')}.`];
    case 'member.role-change':
      return [`Changed the role of ${person()} from ${role('from')} to ${role('to')}.`];
    case 'member.remove':
      return [`Removed ${person()} (${role('role')}) from the study.`];
    case 'member.leave':
      return [`Left the study (was ${role('role')}).`];
    case 'audit.export':
      return [`Downloaded the audit trail (${num('rows') ?? 0} events).`];
    case 'prior.create':
      return ['Created the prior set ', prior(), '.'];
    case 'prior.update':
      return ['Changed the prior set ', prior(), num('version') ? ` (now edit ${num('version')}).` : '.'];
    case 'prior.delete':
      return [`Deleted the prior set ${quote(str('name') ?? '')}.`];
    case 'design.create':
      return ['Created the design ', design(), '.'];
    case 'design.update':
      return ['Changed the design ', design(), num('version') ? ` (now edit ${num('version')}).` : '.'];
    case 'design.delete':
      return [`Deleted the draft design ${quote(str('name') ?? '')}.`];
    case 'design.freeze':
      return ['Froze ', design(), ` as version ${num('number') ?? '?'}`, str('hash') ? ` (SHA-256 ${str('hash')!.slice(0, 12)}…).` : '.'];
    case 'item-bank.export':
      return ['Exported the item bank of ', ...version(), ` as ${(str('format') ?? 'a file').toUpperCase()}${num('seed') !== undefined ? `, seed ${num('seed')}` : ''}.`];
    case 'api-key.create':
      return [`Issued the API key ${quote(str('name') ?? '')} (${str('prefix') ?? ''}…) for `, ...version(), '.'];
    case 'api-key.revoke':
      return [`Revoked the API key ${quote(str('name') ?? '')} (${str('prefix') ?? ''}…).`];
    case 'power-run.start':
      return ['Started ', run(), ' on ', ...version(), `${num('replications') ? ` with ${num('replications')!.toLocaleString('en-GB')} replications` : ''}.`];
    case 'rewards.settings':
      return [`${d.enabled ? 'Turned real rewards on' : 'Turned real rewards off'} for `, ...version(), `${typeof d.capMinor === 'number' ? `, cap ${d.capMinor} minor units` : ''}${typeof d.approvalThresholdMinor === 'number' ? `, owner approval above ${d.approvalThresholdMinor} minor units` : ''}.`];
    case 'payouts.approve':
      return [`Approved ${Array.isArray(d.participants) ? d.participants.length : 0} payout(s) above the threshold${totals(d.totals)}.`];
    case 'payouts.cancel':
      return [`Cancelled ${Array.isArray(d.participants) ? d.participants.length : 0} payout(s)${totals(d.totals)}: ${quote(str('reason') ?? '')}.`];
    case 'power-run.cancel':
      return ['Cancelled ', run(), `${num('completed') !== undefined ? ` after ${num('completed')!.toLocaleString('en-GB')} replicates` : ''}.`];
    case 'power-run.restart':
      return ['Restarted ', run(), '.'];
    default:
      return [describeDetails(d)];
  }
}

/** Details as "key: value · key: value", for actions without a sentence of their own. */
export function describeDetails(details: Record<string, unknown>): string {
  return Object.entries(details)
    .map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`)
    .join(' · ');
}
