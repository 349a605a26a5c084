import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { BusTraceScreen } from '../../../../../components/screens/BusTraceScreen';

export default function BusTraceRoute() {
  const { studyId, busId } = useLocalSearchParams<{ studyId: string; busId: string }>();
  return <BusTraceScreen studyId={String(studyId)} busId={String(busId)} />;
}
