// Roles in increasing order of reach. A higher role can do everything a lower one can,
// except that "manager" and "admin" differ in what they administer (see product.md).
export const ROLES = ['member', 'technician', 'manager', 'admin'] as const;
export type Role = (typeof ROLES)[number];

const rank: Record<Role, number> = { member: 0, technician: 1, manager: 2, admin: 3 };

/** True when `role` is at least `minimum` (member < technician < manager < admin). */
export function hasRole(role: Role, minimum: Role): boolean {
  return rank[role] >= rank[minimum];
}

export function isStaff(role: Role): boolean {
  return hasRole(role, 'technician');
}

export const ROLE_LABELS: Record<Role, string> = {
  member: 'Lab member',
  technician: 'Technician',
  manager: 'Manager',
  admin: 'Administrator',
};
