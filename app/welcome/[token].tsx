import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { LinkPasswordScreen } from '../../components/screens/LinkPasswordScreen';

export default function WelcomeRoute() {
  const { token } = useLocalSearchParams<{ token: string }>();
  return <LinkPasswordScreen key={token} token={String(token)} purpose="invitation" />;
}
