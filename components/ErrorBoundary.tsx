import { Link, type ErrorBoundaryProps } from 'expo-router';
import React, { Component, useState, type ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from './theme';
import { Button, T } from './ui';

/**
 * What a route shows instead of a blank page when it throws while rendering (exported as `ErrorBoundary` by the
 * layouts; Expo Router passes the error and a retry that renders the route again).
 */
export function ErrorBoundary({ error, retry }: ErrorBoundaryProps) {
  const [busy, setBusy] = useState(false);
  return (
    <View testID="error-boundary" style={styles.page}>
      <View style={styles.column}>
        <T variant="title">This page could not be shown</T>
        <T>
          Something went wrong while showing it. Nothing you saved is lost. Try again, or go back to your home screen.
        </T>
        {error?.message ? (
          <T variant="small" style={styles.message} testID="error-boundary-message">
            {error.message}
          </T>
        ) : null}
        <View style={styles.actions}>
          <Button
            title="Retry"
            testID="error-boundary-retry"
            busy={busy}
            onPress={() => {
              setBusy(true);
              void retry().finally(() => setBusy(false));
            }}
          />
          <Link href="/" style={styles.link}>
            Go to your home screen
          </Link>
        </View>
      </View>
    </View>
  );
}

/**
 * The same page for a screen inside the app shell: wrapped around the shell's Slot so that the navigation stays when
 * one screen fails. Another address (`resetKey`, the path) or Retry renders the screen again.
 */
export class ScreenBoundary extends Component<
  { resetKey: string; children: ReactNode },
  { error: Error | null; key: string }
> {
  state = { error: null as Error | null, key: this.props.resetKey };

  static getDerivedStateFromError(error: Error) {
    return { error };
  }

  static getDerivedStateFromProps(props: { resetKey: string }, state: { error: Error | null; key: string }) {
    return props.resetKey !== state.key ? { error: null, key: props.resetKey } : null;
  }

  retry = async () => {
    this.setState({ error: null });
  };

  render() {
    if (this.state.error) return <ErrorBoundary error={this.state.error} retry={this.retry} />;
    return this.props.children;
  }
}

const styles = StyleSheet.create({
  page: {
    flex: 1,
    alignItems: 'center',
    justifyContent: 'center',
    gap: space.md,
    padding: space.xl,
    backgroundColor: colors.canvas,
  },
  column: { width: '100%', maxWidth: 520, gap: space.md },
  message: { color: colors.muted },
  actions: { flexDirection: 'row', gap: space.md, alignItems: 'center', flexWrap: 'wrap' },
  link: { color: colors.accent, fontSize: 16 },
});
