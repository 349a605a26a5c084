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
  { href: '/team', label: 'Team', glyph: '◎', roles: ['admin'] },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => i.roles === 'all' || i.roles.includes(role));
}

export function isActive(href: string, pathname: string): boolean {
  return href === '/' ? pathname === '/' : pathname === href || pathname.startsWith(`${href}/`);
}
