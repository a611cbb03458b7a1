import { hasRole, type Role } from '@shared/roles';

export interface NavItem {
  to: string;
  label: string;
  /** The least role that sees the item; higher roles see it too. */
  minimumRole: Role;
  /** false: a page reached from the admin hub, not listed in the top menu (keeps it short). */
  inMenu?: boolean;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Home', minimumRole: 'member' },
  { to: '/board', label: 'Status board', minimumRole: 'member' },
  { to: '/report', label: 'Report a fault', minimumRole: 'member' },
  { to: '/my-reports', label: 'My reports', minimumRole: 'member' },
  { to: '/following', label: 'Tools I follow', minimumRole: 'member' },
  { to: '/queue', label: 'Queue', minimumRole: 'technician' },
  { to: '/maintenance', label: 'Maintenance', minimumRole: 'technician' },
  { to: '/calendar-feeds', label: 'Calendar feeds', minimumRole: 'member', inMenu: false },
  { to: '/analytics', label: 'Analytics', minimumRole: 'manager' },
  { to: '/admin', label: 'Admin', minimumRole: 'admin' },
  { to: '/admin/service-targets', label: 'Service targets', minimumRole: 'manager' },
  { to: '/admin/mail', label: 'Caught mail', minimumRole: 'admin', inMenu: false },
  { to: '/admin/facility', label: 'Tools and areas', minimumRole: 'admin', inMenu: false },
  { to: '/admin/displays', label: 'Lobby displays', minimumRole: 'admin', inMenu: false },
  { to: '/labels', label: 'QR labels', minimumRole: 'technician', inMenu: false },
];

/** The items a person with `role` sees in the top menu. */
export function navItemsFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.inMenu !== false && hasRole(role, item.minimumRole));
}

/** The path of a page `role` may open, or null; lets other screens link only to what they may open. */
export function openablePath(to: string, role: Role): string | null {
  const item = NAV_ITEMS.find((candidate) => candidate.to === to);
  return item && hasRole(role, item.minimumRole) ? item.to : null;
}
