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
};

/** A readable label for an audit action; actions of other features show as written (e.g. "design.freeze"). */
export function describeAction(action: string): string {
  return LABELS[action] ?? action;
}

/** Details as "key: value · key: value" for the table. */
export function describeDetails(details: Record<string, unknown>): string {
  return Object.entries(details)
    .map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`)
    .join(' · ');
}
