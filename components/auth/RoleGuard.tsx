import { Link } from 'expo-router';
import React from 'react';
import { StyleSheet } from 'react-native';
import { useUser } from '../../hooks/session';
import { can, rolesThatCan, type Capability } from '../../shared/permissions';
import { ROLE_LABELS, type Role } from '../../shared/schemas/common';
import { colors, fonts } from '../theme';
import { Notice, Screen } from '../ui';

/** "administrators, engineers and safety officers" */
export function rolesInWords(roles: readonly Role[]): string {
  const words = roles.map((r) => `${ROLE_LABELS[r].toLowerCase()}s`);
  return words.length > 1 ? `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}` : (words[0] ?? '');
}

/**
 * Shows its children to a signed-in user whose role holds the capability (shared/permissions.ts); anyone else gets a
 * page saying what the page is, who it is for, and the way home. The API refuses those roles on its own (403).
 */
export function RoleGuard({
  capability,
  what,
  children,
}: {
  capability: Capability;
  /** What is behind the guard, as the start of a sentence: "The audit log". */
  what: string;
  children: React.ReactNode;
}) {
  const user = useUser();
  if (can(user.role, capability)) return <>{children}</>;
  return (
    <Screen title="Not available for your role" documentTitle="Not available">
      <Notice testID="role-guard-denied">
        {`${what} is for ${rolesInWords(rolesThatCan(capability))}. You are signed in as ${ROLE_LABELS[user.role].toLowerCase()}.`}
      </Notice>
      <Link href="/" style={styles.homeLink} testID="role-guard-home">
        Go to your home screen
      </Link>
    </Screen>
  );
}

const styles = StyleSheet.create({
  homeLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
});
