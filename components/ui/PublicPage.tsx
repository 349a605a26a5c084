import React from 'react';
import { KeyboardAvoidingView, ScrollView, View } from 'react-native';
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
    <KeyboardAvoidingView style={{ flex: 1, backgroundColor: colors.nav }}>
      <ScrollView role="main" contentContainerStyle={{ flexGrow: 1, justifyContent: 'center', padding: space.lg }}>
        <View style={{ width: '100%', maxWidth: 420, alignSelf: 'center', gap: space.xl }}>
          <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm }}>
            <View style={{ width: 14, height: 34, borderRadius: 7, backgroundColor: colors.accent }} />
            <T style={{ fontFamily: fonts.textBold, fontSize: 30, color: colors.navInk }}>Emberline</T>
          </View>
          <View style={{ backgroundColor: colors.surface, borderRadius: radius.lg, padding: space.xl, gap: space.lg }}>
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
