import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import { SiteScreen } from '../../../components/screens/SiteScreen';

export default function SiteRoute() {
  const { siteId } = useLocalSearchParams<{ siteId: string }>();
  return <SiteScreen siteId={String(siteId)} />;
}
