import { Link } from 'expo-router';
import React from 'react';
import { View } from 'react-native';
import { colors, space } from '../components/theme';
import { T } from '../components/ui';

export default function NotFound() {
  return (
    <View
      style={{
        flex: 1,
        alignItems: 'center',
        justifyContent: 'center',
        gap: space.md,
        padding: space.xl,
        backgroundColor: colors.canvas,
      }}
    >
      <T variant="title">Page not found</T>
      <T>There is nothing at this address.</T>
      <Link href="/" style={{ color: colors.accent, fontSize: 16 }}>
        Go to your home screen
      </Link>
    </View>
  );
}
