import React from 'react';
import { KeyboardAvoidingView, ScrollView, StyleSheet, View } from 'react-native';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';
import { colors, fonts, radius, space } from '../theme';
import { T } from './Text';

/** The frame of the pages reached without signing in (sign-in, password links): the wordmark and one white card. */
export function PublicPage({
  title,
  children,
  footer,
}: {
  title: string;
  children: React.ReactNode;
  footer?: React.ReactNode;
}) {
  useDocumentTitle(title);
  return (
    <KeyboardAvoidingView style={styles.page}>
      <ScrollView role="main" contentContainerStyle={styles.scroll}>
        <View style={styles.column}>
          <View style={styles.wordmark}>
            <View style={styles.mark} />
            <T style={styles.wordmarkText}>Emberline</T>
          </View>
          <View style={styles.card}>
            <T variant="heading" accessibilityRole="header">
              {title}
            </T>
            {children}
          </View>
          {footer}
        </View>
      </ScrollView>
    </KeyboardAvoidingView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.nav },
  scroll: { flexGrow: 1, justifyContent: 'center', padding: space.lg },
  column: { width: '100%', maxWidth: 420, alignSelf: 'center', gap: space.xl },
  wordmark: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  mark: { width: 14, height: 34, borderRadius: 7, backgroundColor: colors.accent },
  wordmarkText: { fontFamily: fonts.textBold, fontSize: 30, color: colors.navInk },
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, padding: space.xl, gap: space.lg },
});
