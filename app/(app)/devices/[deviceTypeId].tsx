import { useLocalSearchParams } from 'expo-router';
import React from 'react';
import type { DeviceKind } from '../../../shared/schemas/device';
import { DeviceTypeScreen } from '../../../components/screens/DeviceTypeScreen';

const KINDS: DeviceKind[] = ['thermal-magnetic', 'electronic', 'fuse', 'relay', 'band'];

export default function DeviceTypeRoute() {
  const { deviceTypeId, kind, saved } = useLocalSearchParams<{ deviceTypeId: string; kind?: string; saved?: string }>();
  if (deviceTypeId === 'new') {
    const k = KINDS.includes(kind as DeviceKind) ? (kind as DeviceKind) : 'thermal-magnetic';
    return <DeviceTypeScreen key={`new-${k}`} kind={k} />;
  }
  return <DeviceTypeScreen key={deviceTypeId} id={String(deviceTypeId)} justSaved={saved === '1'} />;
}
