import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { LinkPasswordScreen } from '../../components/screens/LinkPasswordScreen';

export default function ResetPasswordRoute() {
  const { token } = useLocalSearchParams<{ token: string }>();
  return <LinkPasswordScreen key={token} token={String(token)} purpose="password-reset" />;
}
