import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { LabelCheckScreen } from '../../components/screens/LabelCheckScreen';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';

export default function LabelCheckRoute() {
  const { code } = useLocalSearchParams<{ code: string }>();
  useDocumentTitle('Label check');
  return <LabelCheckScreen code={String(code)} />;
}
