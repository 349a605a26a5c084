import React, { useState } from 'react';
import { View } from 'react-native';
import { changePasswordSchema } from '../../shared/schemas/invitations';
import { ROLE_LABELS } from '../../shared/schemas/common';
import { useChangePassword } from '../../hooks/account';
import { serverErrors, validate } from '../../hooks/forms';
import { useMe } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useSession, useUser } from '../../hooks/session';
import { fonts, space } from '../theme';
import { Button, Card, Field, Notice, Screen, T, ValueRow } from '../ui';

function ChangePassword() {
  const change = useChangePassword();
  const [form, setForm] = useState({ currentPassword: '', newPassword: '', confirm: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const set = (k: keyof typeof form) => (v: string) => setForm((f) => ({ ...f, [k]: v }));

  const submit = () => {
    setMessage(null);
    const v = validate(changePasswordSchema, { currentPassword: form.currentPassword, newPassword: form.newPassword });
    const errs: Record<string, string> = v.ok ? {} : { ...v.errors };
    if (!errs.newPassword && form.confirm !== form.newPassword) errs.confirm = 'The two new passwords differ';
    if (!v.ok || Object.keys(errs).length) return setErrors(errs);
    setErrors({});
    change.mutate(v.data, {
      onSuccess: () => {
        setForm({ currentPassword: '', newPassword: '', confirm: '' });
        setMessage({
          tone: 'ok',
          text: 'Password changed. You stay signed in here; every other device was signed out.',
        });
      },
      onError: (e) => {
        const s = serverErrors(e);
        setErrors(s.fields);
        setMessage({ tone: 'error', text: s.message });
      },
    });
  };

  return (
    <Card testID="change-password">
      <T variant="subheading">Change password</T>
      {message ? (
        <Notice tone={message.tone} testID="password-message">
          {message.text}
        </Notice>
      ) : null}
      <Field
        label="Current password"
        testID="current-password"
        value={form.currentPassword}
        onChangeText={set('currentPassword')}
        secureTextEntry
        autoComplete="current-password"
        error={errors.currentPassword}
      />
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <Field
          label="New password"
          testID="new-password"
          value={form.newPassword}
          onChangeText={set('newPassword')}
          secureTextEntry
          autoComplete="new-password"
          error={errors.newPassword}
          hint="At least 10 characters"
          containerStyle={{ flexGrow: 1, flexBasis: 220 }}
        />
        <Field
          label="New password again"
          testID="confirm-password"
          value={form.confirm}
          onChangeText={set('confirm')}
          secureTextEntry
          autoComplete="new-password"
          error={errors.confirm}
          onSubmitEditing={submit}
          containerStyle={{ flexGrow: 1, flexBasis: 220 }}
        />
      </View>
      <View style={{ flexDirection: 'row' }}>
        <Button title="Change password" testID="change-password-submit" busy={change.isPending} onPress={submit} />
      </View>
    </Card>
  );
}

/** The signed-in person's own account: who they are, their password, signing out. */
export function AccountScreen() {
  const user = useUser();
  const can = useCan();
  const me = useMe();
  const { signOut } = useSession();
  return (
    <Screen title="Account" subtitle="Your sign-in and password.">
      <Card testID="account-details">
        <T variant="subheading">{user.name}</T>
        <View>
          <ValueRow label="E-mail">
            <T style={{ fontFamily: fonts.numbers, fontSize: 15 }}>{user.email}</T>
          </ValueRow>
          <ValueRow label="Role">
            <T style={{ fontSize: 15 }}>{ROLE_LABELS[user.role]}</T>
          </ValueRow>
          {me.data ? (
            <ValueRow label="Organization">
              <T style={{ fontSize: 15 }}>{me.data.organization.name}</T>
            </ValueRow>
          ) : null}
        </View>
        {!can('manageUsers') ? <T variant="small">An administrator changes names and roles.</T> : null}
      </Card>
      <ChangePassword />
      <Card>
        <T variant="subheading">Sign out</T>
        <T variant="small">Ends the session on this device. On a shared tablet, sign out when you are done.</T>
        <View style={{ flexDirection: 'row' }}>
          <Button title="Sign out" kind="secondary" testID="account-sign-out" onPress={() => void signOut()} />
        </View>
      </Card>
    </Screen>
  );
}
