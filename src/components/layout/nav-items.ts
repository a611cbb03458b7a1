import { hasRole, type Role } from '@shared/roles';

export interface NavItem {
  to: string;
  label: string;
  /** The least role that sees the item; higher roles see it too. */
  minimumRole: Role;
  /**
   * Whether the page exists. Items are listed ahead of their pages so the menu's order is
   * settled in one place; whoever adds a page flips its item to `ready: true`.
   */
  ready: boolean;
  /** false: a page reached from the admin hub, not listed in the top menu (keeps it short). */
  inMenu?: boolean;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Home', minimumRole: 'member', ready: true },
  { to: '/board', label: 'Status board', minimumRole: 'member', ready: true },
  { to: '/report', label: 'Report a fault', minimumRole: 'member', ready: true },
  { to: '/my-reports', label: 'My reports', minimumRole: 'member', ready: true },
  { to: '/following', label: 'Tools I follow', minimumRole: 'member', ready: true },
  { to: '/queue', label: 'Queue', minimumRole: 'technician', ready: true },
  { to: '/maintenance', label: 'Maintenance', minimumRole: 'technician', ready: true },
  { to: '/calendar-feeds', label: 'Calendar feeds', minimumRole: 'member', ready: true, inMenu: false },
  { to: '/analytics', label: 'Analytics', minimumRole: 'manager', ready: true },
  { to: '/admin', label: 'Admin', minimumRole: 'admin', ready: true },
  { to: '/admin/service-targets', label: 'Service targets', minimumRole: 'manager', ready: true },
  { to: '/admin/mail', label: 'Caught mail', minimumRole: 'admin', ready: true, inMenu: false },
  { to: '/admin/facility', label: 'Tools and areas', minimumRole: 'admin', ready: true, inMenu: false },
  { to: '/admin/displays', label: 'Lobby displays', minimumRole: 'admin', ready: true, inMenu: false },
  { to: '/labels', label: 'QR labels', minimumRole: 'technician', ready: true, inMenu: false },
];

/** The items a person with `role` sees in the menu: ready pages they may open. */
export function navItemsFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.ready && item.inMenu !== false && hasRole(role, item.minimumRole));
}

/** The path of a ready page `role` may open, or null; lets other screens link only to what exists. */
export function readyPath(to: string, role: Role): string | null {
  const item = NAV_ITEMS.find((candidate) => candidate.to === to);
  return item && item.ready && hasRole(role, item.minimumRole) ? item.to : null;
}
