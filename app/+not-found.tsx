import { Link } from 'expo-router';
import React from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from '../components/theme';
import { T } from '../components/ui';

export default function NotFound() {
  return (
    <View style={styles.page}>
      <T variant="title">Page not found</T>
      <T>There is nothing at this address.</T>
      <Link href="/" style={styles.link}>
        Go to your home screen
      </Link>
    </View>
  );
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
  link: { color: colors.accent, fontSize: 16 },
});
