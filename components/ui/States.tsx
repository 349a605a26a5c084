import React from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { ApiClientError } from '../../hooks/api';
import { colors, radius, space } from '../theme';
import { Notice } from './Notice';
import { T } from './Text';

/** A loading line: what is being loaded. */
export function Loading({ what, testID }: { what: string; testID?: string }) {
  return (
    <View testID={testID ?? 'loading'} style={styles.loading}>
      <ActivityIndicator color={colors.accent} />
      <T variant="small">{what}</T>
    </View>
  );
}

/** An empty list: says what would appear here, and why there is nothing. */
export function Empty({ title, children, testID }: { title: string; children?: React.ReactNode; testID?: string }) {
  return (
    <View testID={testID ?? 'empty'} style={styles.empty}>
      <T variant="subheading">{title}</T>
      {typeof children === 'string' ? <T variant="small">{children}</T> : children}
    </View>
  );
}

/** The message of a failed request, worded for the reader (the API's own message where it sent one). */
export function errorText(error: unknown): string {
  if (error instanceof ApiClientError) return error.message;
  return error instanceof Error ? error.message : 'Something went wrong';
}

export function QueryError({ error, title, testID }: { error: unknown; title?: string; testID?: string }) {
  if (!error) return null;
  return (
    <Notice tone="error" title={title} testID={testID ?? 'query-error'}>
      {errorText(error)}
    </Notice>
  );
}

const styles = StyleSheet.create({
  loading: { flexDirection: 'row', gap: space.sm, alignItems: 'center', paddingVertical: space.sm },
  empty: {
    borderWidth: 1,
    borderStyle: 'dashed',
    borderColor: colors.line,
    borderRadius: radius.lg,
    padding: space.lg,
    gap: space.xs,
    backgroundColor: colors.surface,
  },
});
