import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useSites } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { SiteForm } from '../SiteForm';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Card, Notice, Screen, T } from '../ui';

export function SitesScreen() {
  const can = useCan();
  const { wide } = useLayout();
  const router = useRouter();
  const params = useLocalSearchParams<{ new?: string }>();
  const sites = useSites();
  const canEdit = can('editSites');
  const [creating, setCreating] = useState(params.new === '1' && canEdit);

  return (
    <Screen
      title="Sites"
      subtitle="Facilities whose electrical equipment carries arc-flash labels."
      actions={
        canEdit && !creating ? <Button title="New site" testID="new-site" onPress={() => setCreating(true)} /> : null
      }
    >
      {creating ? (
        <Card>
          <T variant="subheading">New site</T>
          <SiteForm onDone={(s) => router.push(`/sites/${s.id}`)} onCancel={() => setCreating(false)} />
        </Card>
      ) : null}
      {sites.error ? <Notice tone="error">{sites.error.message}</Notice> : null}
      {sites.isLoading ? <T variant="small">Loading sites…</T> : null}
      {sites.data && sites.data.length === 0 ? (
        <Notice>No sites yet.{canEdit ? ' Create the first one.' : ''}</Notice>
      ) : null}
      {sites.data && wide ? (
        <View style={styles.table} testID="sites-table">
          <View style={styles.tableHead}>
            <T variant="label" style={styles.siteHead}>
              SITE
            </T>
            <T variant="label" style={styles.addressHead}>
              ADDRESS
            </T>
            <T variant="label" style={styles.updatedHead}>
              UPDATED
            </T>
          </View>
          {sites.data.map((s) => (
            <Link key={s.id} href={`/sites/${s.id}`} asChild>
              <Pressable accessibilityRole="link" style={styles.row}>
                <T style={styles.siteName}>{s.name}</T>
                <T variant="small" style={styles.address}>
                  {s.address || '—'}
                </T>
                <T variant="small" style={styles.updated}>
                  {s.updatedAt.slice(0, 10)}
                </T>
              </Pressable>
            </Link>
          ))}
        </View>
      ) : (
        sites.data?.map((s) => (
          <Link key={s.id} href={`/sites/${s.id}`} asChild>
            <Pressable accessibilityRole="link">
              <Card>
                <T variant="subheading">{s.name}</T>
                {s.address ? <T variant="small">{s.address}</T> : null}
              </Card>
            </Pressable>
          </Link>
        ))
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  table: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
  },
  tableHead: {
    flexDirection: 'row',
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  siteHead: { flex: 2 },
  addressHead: { flex: 2 },
  updatedHead: { flex: 1 },
  row: {
    flexDirection: 'row',
    minHeight: touch.min,
    alignItems: 'center',
    paddingHorizontal: space.lg,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  siteName: { flex: 2, fontFamily: fonts.textMedium },
  address: { flex: 2 },
  updated: { flex: 1, fontFamily: fonts.numbers },
});
