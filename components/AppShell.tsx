import { Link, usePathname } from 'expo-router';
import React from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { ROLE_LABELS } from '../shared/schemas/common';
import { confirmDiscardingDrafts, useWarnBeforeUnload } from '../hooks/modelDrafts';
import { useSession, useUser } from '../hooks/session';
import { useLayout } from '../hooks/useLayout';
import { currentPageProps, decorative, isActive, MORE_ITEM, navFor, phoneTabsFor } from './nav';
import { colors, fonts, space, touch } from './theme';
import { T } from './ui';

function Wordmark({ light }: { light?: boolean }) {
  return (
    <View style={styles.wordmark}>
      <View style={styles.mark} />
      <T style={[styles.wordmarkText, light ? styles.wordmarkTextLight : styles.wordmarkTextDark]}>Emberline</T>
    </View>
  );
}

/** Phone: a top bar and bottom tabs. From 1024 px: a side navigation. */
export function AppShell({ children }: { children: React.ReactNode }) {
  const { wide } = useLayout();
  const user = useUser();
  const { signOut } = useSession();
  useWarnBeforeUnload();
  const onSignOut = () => {
    if (confirmDiscardingDrafts()) void signOut();
  };
  const pathname = usePathname();
  const insets = useSafeAreaInsets();
  const items = navFor(user.role);
  // A phone has room for five tabs: beyond that the last one opens the full menu.
  const { tabs } = phoneTabsFor(user.role);
  const direct = tabs.filter((t) => t !== MORE_ITEM);

  if (wide) {
    return (
      <View style={styles.wideFrame}>
        <View testID="side-nav" role="navigation" aria-label="Main" style={styles.sideNav}>
          <View style={styles.sideNavBrand}>
            <Wordmark light />
          </View>
          {/* Many items (an administrator's) scroll within the side navigation, keeping the user and sign-out in view. */}
          <ScrollView style={styles.sideNavItems} contentContainerStyle={styles.sideNavItemsContent}>
            {items.map((item) => {
              const on = isActive(item.href, pathname);
              return (
                <Link key={item.href} href={item.href} asChild>
                  <Pressable
                    accessibilityRole="link"
                    accessibilityLabel={item.label}
                    {...currentPageProps(on)}
                    style={on ? styles.navItemOn : styles.navItem}
                  >
                    <T {...decorative} style={[styles.navGlyph, on ? styles.navInkOn : styles.navInkOff]}>
                      {item.glyph}
                    </T>
                    <T style={on ? styles.navLabelOn : styles.navLabel}>{item.label}</T>
                  </Pressable>
                </Link>
              );
            })}
          </ScrollView>
          <View style={styles.user}>
            <T style={styles.userName} testID="shell-user">
              {user.name}
            </T>
            <T style={styles.userRole}>{ROLE_LABELS[user.role]}</T>
          </View>
          <Pressable accessibilityRole="button" onPress={onSignOut} style={styles.sideSignOut}>
            <T style={styles.sideSignOutText}>Sign out</T>
          </Pressable>
        </View>
        <View style={styles.content}>{children}</View>
      </View>
    );
  }

  return (
    <View style={styles.phoneFrame}>
      <View style={[styles.topBar, { paddingTop: insets.top + space.sm }]}>
        <Wordmark light />
        <Pressable accessibilityRole="button" onPress={onSignOut} style={styles.topSignOut}>
          <T style={styles.topSignOutText}>{ROLE_LABELS[user.role]} · Sign out</T>
        </Pressable>
      </View>
      <View style={styles.content}>{children}</View>
      {/* Route links, not tabs over panels: a navigation landmark whose current link has aria-current="page". */}
      <View
        testID="bottom-tabs"
        role="navigation"
        aria-label="Main"
        style={[styles.tabs, { paddingBottom: insets.bottom }]}
      >
        {tabs.map((item) => {
          const on =
            item === MORE_ITEM ? !direct.some((i) => isActive(i.href, pathname)) : isActive(item.href, pathname);
          return (
            <Link key={item.href} href={item.href} asChild>
              <Pressable
                accessibilityRole="link"
                accessibilityLabel={item.label}
                {...currentPageProps(on)}
                style={on ? styles.tabOn : styles.tab}
              >
                <T {...decorative} style={[styles.tabGlyph, on ? styles.tabGlyphOn : styles.tabGlyphOff]}>
                  {item.glyph}
                </T>
                <T style={on ? styles.tabLabelOn : styles.tabLabel}>{item.label}</T>
              </Pressable>
            </Link>
          );
        })}
      </View>
    </View>
  );
}

/** A side-navigation link and a bottom tab: the children of a `Link asChild`, so each state is one plain object. */
const navItem = {
  minHeight: touch.min,
  flexDirection: 'row',
  alignItems: 'center',
  gap: space.md,
  paddingHorizontal: space.md,
  borderRadius: 8,
  backgroundColor: 'transparent',
} as const;
const tab = {
  flex: 1,
  minHeight: 60,
  alignItems: 'center',
  justifyContent: 'center',
  gap: 2,
  borderTopWidth: 3,
  borderTopColor: 'transparent',
} as const;

const styles = StyleSheet.create({
  wordmark: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  wordmarkText: { fontFamily: fonts.textBold, fontSize: 20, letterSpacing: 0.5 },
  wordmarkTextLight: { color: colors.navInk },
  wordmarkTextDark: { color: colors.ink },
  mark: { width: 12, height: 28, borderRadius: 6, backgroundColor: colors.accent },
  wideFrame: { flex: 1, flexDirection: 'row', backgroundColor: colors.canvas },
  sideNav: {
    width: 248,
    backgroundColor: colors.nav,
    paddingVertical: space.xl,
    paddingHorizontal: space.md,
    gap: space.xs,
  },
  sideNavBrand: { paddingHorizontal: space.sm, marginBottom: space.xl },
  sideNavItems: { flex: 1 },
  sideNavItemsContent: { gap: space.xs },
  navItem,
  navItemOn: { ...navItem, backgroundColor: 'rgba(255,255,255,0.12)' },
  navGlyph: { fontSize: 18, width: 22, textAlign: 'center' },
  navInkOn: { color: colors.navInk },
  navInkOff: { color: colors.navMuted },
  navLabel: { color: colors.navMuted, fontFamily: fonts.textMedium },
  navLabelOn: { color: colors.navInk, fontFamily: fonts.textBold },
  user: { paddingHorizontal: space.sm, gap: 2, paddingTop: space.md },
  userName: { color: colors.navInk, fontFamily: fonts.textMedium },
  userRole: { color: colors.navMuted, fontSize: 13 },
  sideSignOut: { minHeight: touch.min, justifyContent: 'center', paddingHorizontal: space.sm },
  sideSignOutText: { color: colors.navMuted, textDecorationLine: 'underline' },
  content: { flex: 1 },
  phoneFrame: { flex: 1, backgroundColor: colors.canvas },
  topBar: {
    paddingBottom: space.sm,
    paddingHorizontal: space.lg,
    backgroundColor: colors.nav,
    flexDirection: 'row',
    alignItems: 'center',
    justifyContent: 'space-between',
  },
  topSignOut: { minHeight: touch.min, justifyContent: 'center', paddingLeft: space.md },
  topSignOutText: { color: colors.navMuted, fontSize: 14 },
  tabs: { flexDirection: 'row', backgroundColor: colors.surface, borderTopWidth: 1, borderTopColor: colors.line },
  tab,
  tabOn: { ...tab, borderTopColor: colors.accent },
  tabGlyph: { fontSize: 20 },
  tabGlyphOn: { color: colors.accent },
  tabGlyphOff: { color: colors.muted },
  tabLabel: { fontSize: 12, fontFamily: fonts.textMedium, color: colors.muted },
  tabLabelOn: { fontSize: 12, fontFamily: fonts.textBold, color: colors.ink },
});
