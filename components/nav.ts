import type { Href } from 'expo-router';
import { Platform } from 'react-native';
import { can, type Capability } from '../shared/permissions';
import type { Role } from '../shared/schemas/common';

/** A path inside the app, checked against Expo Router's generated route types. */
export type AppHref = Extract<Href, string>;

export interface NavItem {
  href: AppHref;
  label: string;
  /** A single glyph drawn in the navigation (no icon font needed). */
  glyph: string;
  /** Shown only to the roles with this capability (shared/permissions.ts); everyone else when absent. */
  capability?: Capability;
}

/** The navigation, in order. Items appear for the roles that may use them. */
export const NAV_ITEMS: NavItem[] = [
  { href: '/', label: 'Home', glyph: '⌂' },
  { href: '/attention', label: 'Attention', glyph: '◈', capability: 'viewAttention' },
  { href: '/sites', label: 'Sites', glyph: '▦' },
  { href: '/labels', label: 'Labels', glyph: '▤' },
  { href: '/scan', label: 'Scan', glyph: '⌖', capability: 'scanLabels' },
  { href: '/reports', label: 'Reports', glyph: '⚑' },
  { href: '/spot-check', label: 'Spot check', glyph: '◇' },
  { href: '/devices', label: 'Devices', glyph: '◔' },
  { href: '/audit-log', label: 'Audit log', glyph: '☷', capability: 'viewAudit' },
  { href: '/reminders', label: 'Reminders', glyph: '◷', capability: 'manageReminders' },
  { href: '/team', label: 'Team', glyph: '◎', capability: 'manageUsers' },
  { href: '/outbox', label: 'Outbox', glyph: '✉', capability: 'readOutbox' },
  { href: '/settings', label: 'Settings', glyph: '≡', capability: 'manageSettings' },
  { href: '/account', label: 'Account', glyph: '◐' },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => !i.capability || can(role, i.capability));
}

/** The phone's first tabs per role: what each role reaches for most; everything else is under More. */
const PHONE_TABS: Record<Role, readonly string[]> = {
  safety: ['/', '/attention', '/labels', '/scan'],
  engineer: ['/', '/sites', '/attention', '/reports'],
  electrician: ['/', '/labels', '/scan', '/reports'],
  admin: ['/', '/attention', '/team', '/sites'],
};

/** A phone has room for five tabs: the role's first four, then More when there are further items. */
export function phoneTabsFor(role: Role): { tabs: NavItem[]; more: boolean } {
  const items = navFor(role);
  if (items.length <= 5) return { tabs: items, more: false };
  const tabs = PHONE_TABS[role].map((href) => items.find((i) => i.href === href)).filter((i): i is NavItem => !!i);
  return { tabs: [...tabs, MORE_ITEM], more: true };
}

export function isActive(href: string, pathname: string): boolean {
  if (href === '/') return pathname === '/';
  // Studies live under their site.
  if (href === '/sites' && pathname.startsWith('/studies/')) return true;
  return pathname === href || pathname.startsWith(`${href}/`);
}

/** The phone's last tab when there are more items than tabs. */
export const MORE_ITEM: NavItem = { href: '/more', label: 'More', glyph: '☰' };

/**
 * A navigation link's "you are here": on the web `aria-current="page"` (react-native-web passes it through; its types
 * do not list it), elsewhere the selected state. `aria-selected` belongs to tabs and options, not to links.
 */
export function currentPageProps(on: boolean): { 'aria-current'?: 'page'; accessibilityState?: { selected: boolean } } {
  if (Platform.OS === 'web') return on ? { 'aria-current': 'page' } : {};
  return { accessibilityState: { selected: on } };
}

/** A glyph beside a label is decoration: screen readers read the label alone. */
export const decorative = { 'aria-hidden': true, importantForAccessibility: 'no-hide-descendants' } as const;
