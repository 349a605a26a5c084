import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { LabelScreen } from '../../../components/screens/LabelScreen';

export default function LabelRoute() {
  const { code } = useLocalSearchParams<{ code: string }>();
  return <LabelScreen key={code} code={String(code)} />;
}
