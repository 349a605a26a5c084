import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Slot } from 'expo-router';
import React, { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { colors } from '../components/theme';
import { SessionProvider } from '../hooks/session';

export { ErrorBoundary } from '../components/ErrorBoundary';

export default function RootLayout() {
  const [queryClient] = useState(
    () =>
      new QueryClient({ defaultOptions: { queries: { staleTime: 15_000, retry: 1, refetchOnWindowFocus: false } } }),
  );
  const [fontsLoaded] = useFonts({
    Inter: require('../fonts/Inter-Regular.ttf'),
    'Inter-Medium': require('../fonts/Inter-Medium.ttf'),
    'Inter-Bold': require('../fonts/Inter-Bold.ttf'),
    PlexMono: require('../fonts/IBMPlexMono-Regular.ttf'),
    'PlexMono-SemiBold': require('../fonts/IBMPlexMono-SemiBold.ttf'),
  });
  if (!fontsLoaded) {
    return (
      <View style={styles.loading}>
        <ActivityIndicator color={colors.accent} />
      </View>
    );
  }
  return (
    <QueryClientProvider client={queryClient}>
      <SessionProvider>
        <Slot />
      </SessionProvider>
    </QueryClientProvider>
  );
}

const styles = StyleSheet.create({
  loading: { flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.canvas },
});
