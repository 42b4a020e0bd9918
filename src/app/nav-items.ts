import { hasRole, type Role } from '../lib/roles';

export interface NavItem {
  to: string;
  label: string;
  /** Least role that may open the page; the server enforces the same rule. */
  minRole: Role;
}

export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Benches', minRole: 'viewer' },
  { to: '/runs', label: 'Runs', minRole: 'viewer' },
  { to: '/programmes', label: 'Programmes', minRole: 'viewer' },
  { to: '/batteries', label: 'Batteries', minRole: 'viewer' },
  { to: '/alarms', label: 'Alarms', minRole: 'viewer' },
  { to: '/instruments', label: 'Instruments', minRole: 'viewer' },
  { to: '/users', label: 'Users', minRole: 'admin' },
  { to: '/settings', label: 'Lab settings', minRole: 'admin' },
  { to: '/account', label: 'My account', minRole: 'viewer' },
];

/** The navigation a role sees: only what it may do. */
export function navItemsFor(role: Role | undefined): NavItem[] {
  return NAV_ITEMS.filter((item) => hasRole(role, item.minRole));
}
