import type { Role } from '../shared/schemas/common';

export interface NavItem {
  href: string;
  label: string;
  /** A single glyph drawn in the navigation (no icon font needed). */
  glyph: string;
  roles: readonly Role[] | 'all';
}

/** The navigation, in order. Items appear for the roles that use them. */
export const NAV_ITEMS: NavItem[] = [
  { href: '/', label: 'Home', glyph: '⌂', roles: 'all' },
  { href: '/sites', label: 'Sites', glyph: '▦', roles: 'all' },
  { href: '/labels', label: 'Labels', glyph: '▤', roles: 'all' },
  { href: '/scan', label: 'Scan', glyph: '⌖', roles: ['electrician', 'engineer', 'safety'] },
  { href: '/spot-check', label: 'Spot check', glyph: '◇', roles: 'all' },
  { href: '/devices', label: 'Devices', glyph: '◔', roles: 'all' },
  { href: '/team', label: 'Team', glyph: '◎', roles: ['admin'] },
  { href: '/settings', label: 'Settings', glyph: '≡', roles: ['admin'] },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => i.roles === 'all' || i.roles.includes(role));
}

export function isActive(href: string, pathname: string): boolean {
  if (href === '/') return pathname === '/';
  // Studies live under their site.
  if (href === '/sites' && pathname.startsWith('/studies/')) return true;
  return pathname === href || pathname.startsWith(`${href}/`);
}

/** The phone's last tab when there are more items than tabs. */
export const MORE_ITEM: NavItem = { href: '/more', label: 'More', glyph: '☰', roles: 'all' };
