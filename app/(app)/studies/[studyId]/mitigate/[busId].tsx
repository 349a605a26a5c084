import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { MitigationScreen } from '../../../../../components/screens/MitigationScreen';

export default function MitigateRoute() {
  const { studyId, busId } = useLocalSearchParams<{ studyId: string; busId: string }>();
  return <MitigationScreen key={`${studyId}:${busId}`} studyId={String(studyId)} busId={String(busId)} />;
}
