import { Link } from 'expo-router';
import React, { useState } from 'react';
import { View } from 'react-native';
import { useSite } from '../../hooks/queries';
import { useUser } from '../../hooks/session';
import { SiteForm } from '../SiteForm';
import { colors, space } from '../theme';
import { Button, Card, Notice, Screen, T } from '../ui';

export function SiteScreen({ siteId }: { siteId: string }) {
  const user = useUser();
  const site = useSite(siteId);
  const [editing, setEditing] = useState(false);
  const canEdit = user.role === 'engineer' || user.role === 'admin';

  if (site.error) {
    return (
      <Screen title="Site">
        <Notice tone="error" title="This site cannot be shown">
          {site.error.message}
        </Notice>
        <Link href="/sites" style={{ color: colors.accent, fontSize: 16 }}>
          Back to sites
        </Link>
      </Screen>
    );
  }
  if (!site.data) return <Screen title="Site"><T variant="small">Loading…</T></Screen>;
  const s = site.data;
  return (
    <Screen
      title={s.name}
      subtitle={s.address || undefined}
      actions={canEdit && !editing ? <Button title="Edit site" kind="secondary" testID="edit-site" onPress={() => setEditing(true)} /> : null}
    >
      {editing ? (
        <Card>
          <T variant="subheading">Edit site</T>
          <SiteForm site={s} onDone={() => setEditing(false)} onCancel={() => setEditing(false)} />
        </Card>
      ) : (
        <Card>
          <T variant="label">ABOUT THIS SITE</T>
          <T>{s.description || 'No description.'}</T>
          <View style={{ flexDirection: 'row', gap: space.xl, flexWrap: 'wrap' }}>
            <T variant="small">Created {s.createdAt.slice(0, 10)}</T>
            <T variant="small">Updated {s.updatedAt.slice(0, 10)}</T>
          </View>
        </Card>
      )}
    </Screen>
  );
}
