import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { findEquipmentClass } from '../../shared/equipmentClasses';
import { createStudySchema } from '../../shared/schemas/studies';
import { serverErrors, useZodForm } from '../../hooks/forms';
import { useSite } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useCreateStudy, useEquipment, useStudies } from '../../hooks/studies';
import { useLayout } from '../../hooks/useLayout';
import { SiteForm } from '../SiteForm';
import { StudyList } from '../studies/StudyList';
import { colors, fonts, space } from '../theme';
import { FormTextField } from '../form';
import { Button, Card, Notice, Screen, T } from '../ui';

function NewStudy({ siteId, onCancel }: { siteId: string; onCancel: () => void }) {
  const router = useRouter();
  const create = useCreateStudy(siteId);
  const form = useZodForm(createStudySchema, { defaultValues: { title: 'Arc-flash study' } });
  const submit = () =>
    void form.handleSubmit((data) =>
      create.mutate(data, {
        onSuccess: (s) => router.push(`/studies/${s.id}?tab=model`),
        // The only field: the server's message goes under it.
        onError: (e) => form.setError('title', { type: 'server', message: serverErrors(e).message }),
      }),
    )();
  return (
    <Card testID="new-study">
      <T variant="subheading">Start a study</T>
      <T variant="small">
        A new draft revision with an empty model. Import a workbook, CSV files or a JSON model, or build it in the
        editor.
      </T>
      <FormTextField control={form.control} name="title" label="Title" testID="study-title" />
      <View style={styles.buttonRow}>
        <Button title="Start the study" testID="create-study" busy={create.isPending} onPress={submit} />
        <Button title="Cancel" kind="secondary" onPress={onCancel} />
      </View>
    </Card>
  );
}

export function SiteScreen({ siteId }: { siteId: string }) {
  const can = useCan();
  const { wide } = useLayout();
  const site = useSite(siteId);
  const studies = useStudies(siteId);
  const equipment = useEquipment(siteId);
  const [editing, setEditing] = useState(false);
  const [starting, setStarting] = useState(false);
  const canEdit = can('editSites');
  const canStudy = can('startStudy');

  if (site.error) {
    return (
      <Screen title="Site">
        <Notice tone="error" title="This site cannot be shown">
          {site.error.message}
        </Notice>
        <Link href="/sites" style={styles.backLink}>
          Back to sites
        </Link>
      </Screen>
    );
  }
  if (!site.data)
    return (
      <Screen title="Site">
        <T variant="small">Loading…</T>
      </Screen>
    );
  const s = site.data;
  const open = studies.data?.find((x) => x.status === 'draft' || x.status === 'in-review');
  return (
    <Screen
      title={s.name}
      subtitle={s.address || undefined}
      actions={
        <>
          {canStudy && !starting && !open ? (
            <Button title="Start a study" testID="start-study" onPress={() => setStarting(true)} />
          ) : null}
          {canEdit && !editing ? (
            <Button title="Edit site" kind="secondary" testID="edit-site" onPress={() => setEditing(true)} />
          ) : null}
        </>
      }
    >
      {starting ? <NewStudy siteId={siteId} onCancel={() => setStarting(false)} /> : null}
      {editing ? (
        <Card>
          <T variant="subheading">Edit site</T>
          <SiteForm site={s} onDone={() => setEditing(false)} onCancel={() => setEditing(false)} />
        </Card>
      ) : s.description ? (
        <T style={styles.description}>{s.description}</T>
      ) : null}

      <View style={styles.section}>
        <T variant="heading">Studies</T>
        {studies.error ? <Notice tone="error">{studies.error.message}</Notice> : null}
        {studies.data && studies.data.length === 0 ? (
          <Notice>{can('seeUnapprovedStudies') ? 'No study yet.' : 'No approved study yet.'}</Notice>
        ) : null}
        {studies.data?.length ? <StudyList studies={studies.data} /> : null}
      </View>

      <View style={styles.section}>
        <T variant="heading">Equipment</T>
        <T variant="small">The equipment that carries labels, from the site’s approved studies.</T>
        {equipment.data && equipment.data.length === 0 ? (
          <Notice>No equipment yet: it appears when a study is approved.</Notice>
        ) : null}
        <View style={[styles.equipmentList, wide && styles.equipmentListWide]}>
          {equipment.data?.map((e) => (
            <Card key={e.id} style={[styles.equipment, wide && styles.equipmentWide]} testID={`equipment-${e.tag}`}>
              <T style={styles.tag}>{e.tag}</T>
              <T>{e.name}</T>
              <T variant="small">
                {findEquipmentClass(e.equipmentClass)?.label ?? e.equipmentClass} ·{' '}
                {e.nominalKv >= 1 ? `${e.nominalKv} kV` : `${Math.round(e.nominalKv * 1000)} V`}
              </T>
            </Card>
          ))}
        </View>
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  buttonRow: { flexDirection: 'row', gap: space.sm },
  backLink: { color: colors.accent, fontSize: 16 },
  description: { color: colors.inkSoft },
  section: { gap: space.sm },
  equipmentList: { flexWrap: 'wrap', gap: space.sm },
  /** Three cards a row on a wide screen. */
  equipmentListWide: { flexDirection: 'row' },
  equipment: { flexGrow: 1, gap: 2, padding: space.md },
  equipmentWide: { flexBasis: '31%' },
  tag: { fontFamily: fonts.numbersBold },
});
