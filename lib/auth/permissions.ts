import type { Role } from './roles';

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
};
