import type { Role } from '@/lib/shared/roles';

/**
 * Who may call each API route. `public`: anyone; `signed-in`: any signed-in user; `api-key`: a
 * study's API key (Bearer); a role: members of the study with at least that role (non-members
 * get 404). The route-matrix test walks app/api and fails for any route or method missing here,
 * and checks each entry against the handler's real behaviour.
 */
export type Access = 'public' | 'signed-in' | 'api-key' | Role;
export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export const apiPermissions: Record<string, Partial<Record<Method, Access>>> = {
  '/api/auth/[...nextauth]': { GET: 'public', POST: 'public' },
  '/api/health': { GET: 'public' },
  '/api/users': { POST: 'public' },
  '/api/studies': { GET: 'signed-in', POST: 'signed-in' },
  '/api/studies/[id]': { GET: 'viewer', PATCH: 'owner', DELETE: 'owner' },
  '/api/studies/[id]/members': { GET: 'viewer' },
  // Team: owners manage invitations and roles; DELETE on a membership is also how any member leaves.
  '/api/studies/[id]/members/[userId]': { PATCH: 'owner', DELETE: 'viewer' },
  '/api/studies/[id]/invitations': { GET: 'owner', POST: 'owner' },
  '/api/studies/[id]/invitations/[invitationId]': { DELETE: 'owner' },
  '/api/studies/[id]/invitations/[invitationId]/resend': { POST: 'owner' },
  '/api/studies/[id]/audit': { GET: 'editor' },
  '/api/studies/[id]/audit/csv': { GET: 'editor' },
  '/api/invitations/accept': { POST: 'signed-in' },
  '/api/invitations/[token]': { GET: 'public' },
  '/api/password-reset': { POST: 'public' },
  '/api/password-reset/complete': { POST: 'public' },
  '/api/password-reset/[token]': { GET: 'public' },
  '/api/account/notices': { GET: 'signed-in', PUT: 'signed-in' },
  '/api/account/password': { PUT: 'signed-in' },
  '/api/mailbox': { GET: 'signed-in' },
  // account security: confirming an address (the link's token is the proof) and asking for a new link
  '/api/email-confirmation': { POST: 'public' },
  '/api/email-confirmation/resend': { POST: 'signed-in' },
  // planner: viewers read; editors write; any member may comment
  '/api/studies/[id]/priors': { GET: 'viewer', POST: 'editor' },
  '/api/studies/[id]/priors/pilot': { POST: 'editor' },
  '/api/studies/[id]/priors/[priorId]': { GET: 'viewer', PUT: 'editor', DELETE: 'editor' },
  '/api/studies/[id]/designs': { GET: 'viewer', POST: 'editor' },
  '/api/studies/[id]/designs/[designId]': { GET: 'viewer', PUT: 'editor', DELETE: 'editor' },
  '/api/studies/[id]/designs/[designId]/summary': { GET: 'viewer' },
  '/api/studies/[id]/designs/[designId]/freeze': { POST: 'editor' },
  '/api/studies/[id]/designs/[designId]/comments': { GET: 'viewer', POST: 'viewer' },
  '/api/studies/[id]/design-versions': { GET: 'viewer' },
  '/api/studies/[id]/design-versions/[versionId]': { GET: 'viewer' },
  // power: everyone in the study opens runs and downloads; editors start, cancel and restart
  '/api/studies/[id]/power-runs': { GET: 'viewer', POST: 'editor' },
  '/api/studies/[id]/power-runs/[runId]': { GET: 'viewer' },
  '/api/studies/[id]/power-runs/[runId]/cancel': { POST: 'editor' },
  '/api/studies/[id]/power-runs/[runId]/restart': { POST: 'editor' },
  '/api/studies/[id]/power-runs/[runId]/export': { GET: 'viewer' },
  '/api/studies/[id]/item-bank': { GET: 'operator' },
  '/api/studies/[id]/item-bank/[versionId]': { GET: 'operator' },
  '/api/studies/[id]/item-bank/[versionId]/export': { GET: 'operator' },
  '/api/studies/[id]/api-keys': { GET: 'operator', POST: 'operator' },
  '/api/studies/[id]/api-keys/[keyId]': { DELETE: 'operator' },
  '/api/studies/[id]/participants': { GET: 'viewer' },
  '/api/studies/[id]/participants/batch': { POST: 'operator' },
  // Results (issue 14): observed choices (operators upload them), saved analyses and their downloads.
  '/api/studies/[id]/observed-choices': { GET: 'viewer', POST: 'operator' },
  '/api/studies/[id]/analyses': { GET: 'viewer', POST: 'editor' },
  '/api/studies/[id]/analyses/[analysisId]': { GET: 'viewer' },
  '/api/studies/[id]/analyses/[analysisId]/export': { GET: 'viewer' },
  '/api/v1/studies/[id]/probe-items': { POST: 'api-key' },
  '/api/v1/openapi.json': { GET: 'public' },
  // Two-stage session API (issue 13): server and browser keys of the study; a browser key also
  // needs the participant's session token and a listed origin (CORS preflights, OPTIONS, are public).
  '/api/v1/studies/[id]/calibration': { GET: 'api-key' },
  '/api/v1/studies/[id]/stage2-answers': { POST: 'api-key' },
  // Adaptive calibration (issue 17): the next-item step, same keys and token rule as the session API.
  '/api/v1/studies/[id]/calibration-next': { POST: 'api-key' },
  '/api/studies/[id]/item-bank/[versionId]/starter': { GET: 'operator' },
  '/api/studies/[id]/sessions': { GET: 'viewer', PATCH: 'operator' },
  // Session page (issue 13): operators manage participant links and preview them; participants
  // use the page's own API without an account (rate-limited, session token in an httpOnly cookie).
  '/api/studies/[id]/session-links': { GET: 'operator', POST: 'operator' },
  '/api/studies/[id]/session-links/[linkId]': { PATCH: 'operator' },
  '/api/studies/[id]/session-links/[linkId]/preview': { POST: 'operator' },
  '/api/session-page/[slug]': { GET: 'public', POST: 'public' },
  // Real rewards (issue 20): operators see the settings and the payout ledger; owners turn real
  // rewards on, approve payouts above the threshold and cancel; participants' payment details
  // arrive through the session API's keys.
  '/api/studies/[id]/rewards': { GET: 'operator' },
  '/api/studies/[id]/rewards/[versionId]': { PUT: 'owner' },
  '/api/studies/[id]/payouts': { GET: 'operator' },
  '/api/studies/[id]/payouts/approve': { POST: 'owner' },
  '/api/studies/[id]/payouts/cancel': { POST: 'owner' },
  '/api/v1/studies/[id]/payment-details': { POST: 'api-key' },
};
