import { ROLE_LABELS, ROLES, type Role } from '@shared/roles';

export const ROLE_OPTIONS: readonly { value: Role; label: string }[] = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

export const ROLE_HINT =
  'Lab members report faults and follow tools; technicians also triage and repair; managers also see analytics; administrators also manage people and tools.';

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}

export const ON_CALL_HINT =
  'People on call are told at once, by e-mail and in Faultline, when a report names a hazard. It does not replace the facility’s own emergency call-out.';
