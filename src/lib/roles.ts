/** The three roles; each includes everything the one before it may do. */
export const ROLES = ['viewer', 'technician', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** True when `role` is at least `min` (admin ⊇ technician ⊇ viewer). */
export function hasRole(role: Role | undefined, min: Role): boolean {
  if (!role) return false;
  return ROLES.indexOf(role) >= ROLES.indexOf(min);
}
