import { Link, usePathname } from 'expo-router';
import React from 'react';
import { Pressable, ScrollView, View } from 'react-native';
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
    <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm }}>
      <View style={{ width: 12, height: 28, borderRadius: 6, backgroundColor: colors.accent }} />
      <T
        style={{
          fontFamily: fonts.textBold,
          fontSize: 20,
          color: light ? colors.navInk : colors.ink,
          letterSpacing: 0.5,
        }}
      >
        Emberline
      </T>
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
      <View style={{ flex: 1, flexDirection: 'row', backgroundColor: colors.canvas }}>
        <View
          testID="side-nav"
          role="navigation"
          aria-label="Main"
          style={{
            width: 248,
            backgroundColor: colors.nav,
            paddingVertical: space.xl,
            paddingHorizontal: space.md,
            gap: space.xs,
          }}
        >
          <View style={{ paddingHorizontal: space.sm, marginBottom: space.xl }}>
            <Wordmark light />
          </View>
          {/* Many items (an administrator's) scroll within the side navigation, keeping the user and sign-out in view. */}
          <ScrollView style={{ flex: 1 }} contentContainerStyle={{ gap: space.xs }}>
            {items.map((item) => {
              const on = isActive(item.href, pathname);
              return (
                <Link key={item.href} href={item.href} asChild>
                  <Pressable
                    accessibilityRole="link"
                    accessibilityLabel={item.label}
                    {...currentPageProps(on)}
                    style={{
                      minHeight: touch.min,
                      flexDirection: 'row',
                      alignItems: 'center',
                      gap: space.md,
                      paddingHorizontal: space.md,
                      borderRadius: 8,
                      backgroundColor: on ? 'rgba(255,255,255,0.12)' : 'transparent',
                    }}
                  >
                    <T
                      {...decorative}
                      style={{
                        color: on ? colors.navInk : colors.navMuted,
                        fontSize: 18,
                        width: 22,
                        textAlign: 'center',
                      }}
                    >
                      {item.glyph}
                    </T>
                    <T
                      style={{
                        color: on ? colors.navInk : colors.navMuted,
                        fontFamily: on ? fonts.textBold : fonts.textMedium,
                      }}
                    >
                      {item.label}
                    </T>
                  </Pressable>
                </Link>
              );
            })}
          </ScrollView>
          <View style={{ paddingHorizontal: space.sm, gap: 2, paddingTop: space.md }}>
            <T style={{ color: colors.navInk, fontFamily: fonts.textMedium }} testID="shell-user">
              {user.name}
            </T>
            <T style={{ color: colors.navMuted, fontSize: 13 }}>{ROLE_LABELS[user.role]}</T>
          </View>
          <Pressable
            accessibilityRole="button"
            onPress={onSignOut}
            style={{ minHeight: touch.min, justifyContent: 'center', paddingHorizontal: space.sm }}
          >
            <T style={{ color: colors.navMuted, textDecorationLine: 'underline' }}>Sign out</T>
          </Pressable>
        </View>
        <View style={{ flex: 1 }}>{children}</View>
      </View>
    );
  }

  return (
    <View style={{ flex: 1, backgroundColor: colors.canvas }}>
      <View
        style={{
          paddingTop: insets.top + space.sm,
          paddingBottom: space.sm,
          paddingHorizontal: space.lg,
          backgroundColor: colors.nav,
          flexDirection: 'row',
          alignItems: 'center',
          justifyContent: 'space-between',
        }}
      >
        <Wordmark light />
        <Pressable
          accessibilityRole="button"
          onPress={onSignOut}
          style={{ minHeight: touch.min, justifyContent: 'center', paddingLeft: space.md }}
        >
          <T style={{ color: colors.navMuted, fontSize: 14 }}>{ROLE_LABELS[user.role]} · Sign out</T>
        </Pressable>
      </View>
      <View style={{ flex: 1 }}>{children}</View>
      {/* Route links, not tabs over panels: a navigation landmark whose current link has aria-current="page". */}
      <View
        testID="bottom-tabs"
        role="navigation"
        aria-label="Main"
        style={{
          flexDirection: 'row',
          backgroundColor: colors.surface,
          borderTopWidth: 1,
          borderTopColor: colors.line,
          paddingBottom: insets.bottom,
        }}
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
                style={{
                  flex: 1,
                  minHeight: 60,
                  alignItems: 'center',
                  justifyContent: 'center',
                  gap: 2,
                  borderTopWidth: 3,
                  borderTopColor: on ? colors.accent : 'transparent',
                }}
              >
                <T {...decorative} style={{ fontSize: 20, color: on ? colors.accent : colors.muted }}>
                  {item.glyph}
                </T>
                <T
                  style={{
                    fontSize: 12,
                    fontFamily: on ? fonts.textBold : fonts.textMedium,
                    color: on ? colors.ink : colors.muted,
                  }}
                >
                  {item.label}
                </T>
              </Pressable>
            </Link>
          );
        })}
      </View>
    </View>
  );
}
