import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { Device, DeviceKind } from '../../shared/schemas/device';
import { DEVICE_KIND_LABELS, genericNoteSentence } from '../../shared/schemas/deviceLibrary';
import { useDeviceTypes } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space } from '../theme';
import { Button, Card, Choice, Field, ListScreen, Notice, T } from '../ui';

const KINDS = Object.keys(DEVICE_KIND_LABELS) as DeviceKind[];

/** A one-line summary of the settings that matter most. */
function summary(d: Device): string {
  switch (d.kind) {
    case 'thermal-magnetic':
      return `${d.ratingA} A · instantaneous ${d.instantaneous?.pickupMultiple ?? `${d.instantaneous?.lowMultiple}–${d.instantaneous?.highMultiple}`} × rating`;
    case 'electronic':
      return `In ${d.sensorA} A · Ir ${d.longTime.pickup} × In · LTD ${d.longTime.delayS} s${d.shortTime ? ` · ST ${d.shortTime.pickup} × Ir ${d.shortTime.delayS} s` : ''}${d.instantaneous ? ` · INST ${d.instantaneous.pickup} × In` : ''}`;
    case 'fuse':
      return `${d.ratingA} A · ${d.totalClearing?.length ?? 0} total-clearing points`;
    case 'relay':
      return `${d.curve} · pickup ${d.pickupA ?? (d.pickupSecondaryA !== undefined && d.ctRatio !== undefined ? d.pickupSecondaryA * d.ctRatio : '—')} A · TD ${d.timeDial} · ${d.breakerCycles}-cycle breaker`;
    case 'band':
      return `${d.ratingA} A · ${d.max.length} points (${d.currentUnit === 'multiple' ? 'multiples of rating' : 'amperes'})`;
  }
}

export function DevicesScreen() {
  const canEdit = useCan()('editDevices');
  const router = useRouter();
  const { wide } = useLayout();
  const types = useDeviceTypes();
  const [filter, setFilter] = useState<DeviceKind | 'all'>('all');
  const [choosing, setChoosing] = useState(false);
  const [search, setSearch] = useState('');
  const words = search.trim().toLowerCase().split(/\s+/).filter(Boolean);
  const shown =
    types.data?.filter(
      (t) =>
        (filter === 'all' || t.kind === filter) &&
        words.every((w) => `${t.name} ${t.description}`.toLowerCase().includes(w)),
    ) ?? [];

  // The library grows with every device type an organization adds: its cards are a virtualized list.
  return (
    <ListScreen
      title="Device library"
      subtitle="Protective devices and their trip bands: the clearing time of every label is read from one of these."
      actions={
        canEdit ? <Button title="New device type" testID="new-device" onPress={() => setChoosing((c) => !c)} /> : null
      }
      data={shown}
      keyExtractor={(t) => t.id}
      numColumns={wide ? 2 : 1}
      renderItem={(t) => (
        <View style={styles.cell}>
          <Link href={`/devices/${t.id}`} asChild>
            <Pressable accessibilityRole="link" style={styles.cardLink} testID={`device-${t.name}`}>
              <Card style={styles.card}>
                <View style={styles.cardHead}>
                  <T variant="subheading" style={styles.name}>
                    {t.name}
                  </T>
                  <View style={styles.kind}>
                    <T style={styles.kindText}>{DEVICE_KIND_LABELS[t.kind]}</T>
                  </View>
                </View>
                <T variant="small" style={styles.summary}>
                  {summary(t.device)}
                </T>
                {t.description ? <T variant="small">{t.description}</T> : null}
                {t.genericNote ? (
                  <T variant="small" style={styles.genericNote} testID={`device-note-${t.name}`}>
                    {genericNoteSentence(t.genericNote)}
                  </T>
                ) : null}
              </Card>
            </Pressable>
          </Link>
        </View>
      )}
    >
      {choosing ? (
        <Card testID="choose-kind">
          <T variant="subheading">What kind of device?</T>
          <View style={[styles.kinds, wide && styles.kindsWide]}>
            {KINDS.map((k) => (
              <Button
                key={k}
                title={DEVICE_KIND_LABELS[k]}
                kind="secondary"
                testID={`new-${k}`}
                onPress={() => router.push(`/devices/new?kind=${k}`)}
              />
            ))}
          </View>
        </Card>
      ) : null}
      <Choice
        value={filter}
        options={[{ value: 'all', label: 'All' }, ...KINDS.map((k) => ({ value: k, label: DEVICE_KIND_LABELS[k] }))]}
        onChange={setFilter}
        testID="kind-filter"
      />
      <Field
        label="Find by name"
        value={search}
        onChangeText={setSearch}
        placeholder="e.g. 400 A fuse, LSIG, very inverse"
        testID="device-search"
        containerStyle={styles.filter}
      />
      {types.error ? <Notice tone="error">{types.error.message}</Notice> : null}
      {types.isLoading ? <T variant="small">Loading…</T> : null}
      {types.data && shown.length === 0 ? (
        <Notice>
          {words.length > 0 ? 'No device type matches these words.' : 'No device types of this kind yet.'}
        </Notice>
      ) : null}
    </ListScreen>
  );
}

const styles = StyleSheet.create({
  cell: { flex: 1, marginTop: space.md },
  cardLink: { flexGrow: 1 },
  card: { height: '100%' },
  cardHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, flexWrap: 'wrap' },
  name: { flexShrink: 1 },
  kind: {
    backgroundColor: colors.accentSoft,
    borderRadius: radius.sm,
    paddingHorizontal: space.sm,
    paddingVertical: 2,
  },
  kindText: { fontSize: 13, fontFamily: fonts.textMedium, color: colors.ink },
  summary: { fontFamily: fonts.numbers, fontSize: 13 },
  genericNote: { color: colors.caution, fontFamily: fonts.textMedium },
  kinds: { gap: space.sm, flexWrap: 'wrap' },
  kindsWide: { flexDirection: 'row' },
  filter: { maxWidth: 480 },
});
