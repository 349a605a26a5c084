import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { LabelCheckScreen } from '../../components/screens/LabelCheckScreen';

export default function LabelCheckRoute() {
  const { code } = useLocalSearchParams<{ code: string }>();
  return <LabelCheckScreen code={String(code)} />;
}
