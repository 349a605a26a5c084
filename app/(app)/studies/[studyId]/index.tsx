import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { StudyScreen } from '../../../../components/screens/StudyScreen';

export default function StudyRoute() {
  const { studyId } = useLocalSearchParams<{ studyId: string }>();
  return <StudyScreen key={studyId} studyId={String(studyId)} />;
}
