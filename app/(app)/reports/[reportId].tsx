import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { ReportScreen } from '../../../components/screens/ReportScreen';

export default function ReportRoute() {
  const { reportId } = useLocalSearchParams<{ reportId: string }>();
  return <ReportScreen key={reportId} reportId={String(reportId)} />;
}
