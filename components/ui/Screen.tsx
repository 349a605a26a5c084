import React from 'react';
import { ScrollView, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';
import { colors, space } from '../theme';
import { T } from './Text';

/** A scrolling page with a title; wide screens get a readable maximum width. */
export function Screen({
  title,
  subtitle,
  actions,
  children,
  maxWidth = 1200,
  documentTitle,
}: {
  title: string;
  /** The browser tab's name for the page when the heading is not a good one (default: the heading). */
  documentTitle?: string;
  subtitle?: string;
  actions?: React.ReactNode;
  children: React.ReactNode;
  maxWidth?: number;
}) {
  const { wide } = useLayout();
  useDocumentTitle(documentTitle ?? title);
  return (
    // The page's main landmark; focusable so a keyboard can scroll it when it holds no control (axe:
    // scrollable-region-focusable).
    <ScrollView
      role="main"
      focusable
      style={{ flex: 1, backgroundColor: colors.canvas }}
      contentContainerStyle={{ padding: wide ? space.xxl : space.lg, paddingBottom: 96 }}
    >
      <View style={{ width: '100%', maxWidth, alignSelf: 'center', gap: space.lg }}>
        <View
          style={{
            flexDirection: wide ? 'row' : 'column',
            justifyContent: 'space-between',
            gap: space.md,
            alignItems: wide ? 'flex-end' : 'stretch',
          }}
        >
          <View style={{ gap: space.xs, flexShrink: 1 }}>
            <T variant="title" accessibilityRole="header">
              {title}
            </T>
            {subtitle ? <T variant="small">{subtitle}</T> : null}
          </View>
          {actions ? <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>{actions}</View> : null}
        </View>
        {children}
      </View>
    </ScrollView>
  );
}
