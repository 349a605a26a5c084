import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { siteInputSchema, type Site } from '../shared/schemas/sites';
import { applyServerErrors, useZodForm } from '../hooks/forms';
import { useSaveSite } from '../hooks/queries';
import { space } from './theme';
import { FormTextField } from './form';
import { Button, Notice } from './ui';

/** Create or edit a site; validated with the shared schema before it is sent. */
export function SiteForm({
  site,
  onDone,
  onCancel,
}: {
  site?: Site;
  onDone: (s: Site) => void;
  onCancel?: () => void;
}) {
  const form = useZodForm(siteInputSchema, {
    defaultValues: { name: site?.name ?? '', address: site?.address ?? '', description: site?.description ?? '' },
  });
  const [message, setMessage] = useState<string | null>(null);
  const save = useSaveSite(site?.id);

  const submit = () =>
    void form.handleSubmit((data) =>
      save.mutate(data, {
        onSuccess: onDone,
        onError: (e) => setMessage(applyServerErrors(form, e)),
      }),
    )();

  return (
    <View style={styles.form} testID="site-form">
      {message ? <Notice tone="error">{message}</Notice> : null}
      <FormTextField control={form.control} name="name" label="Site name" testID="site-name" />
      <FormTextField control={form.control} name="address" label="Address" testID="site-address" />
      <FormTextField
        control={form.control}
        name="description"
        label="Description"
        testID="site-description"
        multiline
        style={styles.description}
      />
      <View style={styles.buttons}>
        <Button title={site ? 'Save site' : 'Create site'} testID="site-save" busy={save.isPending} onPress={submit} />
        {onCancel ? <Button title="Cancel" kind="secondary" onPress={onCancel} /> : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.md },
  description: { minHeight: 96 },
  buttons: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
