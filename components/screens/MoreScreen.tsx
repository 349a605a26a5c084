import { Link } from 'expo-router';
import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { ROLE_LABELS } from '../../shared/schemas/common';
import { useSession, useUser } from '../../hooks/session';
import { navFor } from '../nav';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Screen, T } from '../ui';

/** The full menu on a phone. */
export function MoreScreen() {
  const user = useUser();
  const { signOut } = useSession();
  return (
    <Screen title="Menu" subtitle={`${user.name} · ${ROLE_LABELS[user.role]}`}>
      <View style={styles.menu}>
        {navFor(user.role).map((item) => (
          <Link key={item.href} href={item.href} asChild>
            <Pressable accessibilityRole="link" style={styles.item}>
              <T style={styles.glyph}>{item.glyph}</T>
              <T style={styles.itemLabel}>{item.label}</T>
            </Pressable>
          </Link>
        ))}
      </View>
      <Button title="Sign out" kind="secondary" onPress={() => void signOut()} />
    </Screen>
  );
}

const styles = StyleSheet.create({
  menu: { gap: space.sm },
  item: {
    minHeight: touch.min + 8,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.lg,
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
  },
  glyph: { fontSize: 20, width: 24, textAlign: 'center', color: colors.accent },
  itemLabel: { fontFamily: fonts.textMedium, fontSize: 17 },
});
