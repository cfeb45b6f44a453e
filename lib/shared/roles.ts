/** Study roles from least to most privileged; each role can do everything the ones before it can. */
export const ROLES = ['viewer', 'operator', 'editor', 'owner'] as const;
export type Role = (typeof ROLES)[number];

/** True when `role` is at least as privileged as `needed`. */
export function roleAtLeast(role: Role, needed: Role): boolean {
  return ROLES.indexOf(role) >= ROLES.indexOf(needed);
}

export const ROLE_LABELS: Record<Role, string> = {
  viewer: 'Viewer',
  operator: 'Operator',
  editor: 'Editor',
  owner: 'Owner',
};
