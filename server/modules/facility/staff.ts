import type { Role } from '../../../shared/roles';

/** Roles that may look after a tool as its primary or backup engineer. */
export const STAFF_ROLES: readonly Role[] = ['technician', 'manager', 'admin'];
