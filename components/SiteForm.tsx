import React, { useState } from 'react';
import { View } from 'react-native';
import { siteInputSchema, type Site } from '../shared/schemas/sites';
import { serverErrors, validate } from '../hooks/forms';
import { useSaveSite } from '../hooks/queries';
import { space } from './theme';
import { Button, Field, Notice } from './ui';

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
  const [name, setName] = useState(site?.name ?? '');
  const [address, setAddress] = useState(site?.address ?? '');
  const [description, setDescription] = useState(site?.description ?? '');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const save = useSaveSite(site?.id);

  const submit = () => {
    const v = validate(siteInputSchema, { name, address, description });
    if (!v.ok) return setErrors(v.errors);
    setErrors({});
    save.mutate(v.data, {
      onSuccess: onDone,
      onError: (e) => {
        const s = serverErrors(e);
        setMessage(s.message);
        setErrors(s.fields);
      },
    });
  };

  return (
    <View style={{ gap: space.md }} testID="site-form">
      {message ? <Notice tone="error">{message}</Notice> : null}
      <Field label="Site name" testID="site-name" value={name} onChangeText={setName} error={errors.name} />
      <Field label="Address" testID="site-address" value={address} onChangeText={setAddress} error={errors.address} />
      <Field
        label="Description"
        testID="site-description"
        value={description}
        onChangeText={setDescription}
        error={errors.description}
        multiline
        style={{ minHeight: 96 }}
      />
      <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>
        <Button title={site ? 'Save site' : 'Create site'} testID="site-save" busy={save.isPending} onPress={submit} />
        {onCancel ? <Button title="Cancel" kind="secondary" onPress={onCancel} /> : null}
      </View>
    </View>
  );
}
