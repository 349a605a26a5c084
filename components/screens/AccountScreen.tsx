import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { passwordSchema } from '../../shared/schemas/auth';
import { changePasswordSchema } from '../../shared/schemas/invitations';
import { ROLE_LABELS } from '../../shared/schemas/common';
import { useChangePassword } from '../../hooks/account';
import { applyServerErrors, useZodForm } from '../../hooks/forms';
import { useMe } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useSession, useUser } from '../../hooks/session';
import { useUnitSystem } from '../../hooks/unitSystem';
import { fonts, space } from '../theme';
import { FormTextField } from '../form';
import { Button, Card, Choice, Notice, Screen, T, ValueRow } from '../ui';

/** The password change with the new password typed twice (compared once the new one is acceptable). */
const changePasswordForm = changePasswordSchema
  .extend({ confirm: z.string() })
  .refine((f) => f.confirm === f.newPassword, {
    path: ['confirm'],
    message: 'The two new passwords differ',
    when: ({ value }) => passwordSchema.safeParse((value as { newPassword?: unknown }).newPassword).success,
  });
const emptyPasswords = { currentPassword: '', newPassword: '', confirm: '' };

function ChangePassword() {
  const change = useChangePassword();
  const form = useZodForm(changePasswordForm, { defaultValues: emptyPasswords });
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);

  const submit = () => {
    setMessage(null);
    void form.handleSubmit(({ currentPassword, newPassword }) =>
      change.mutate(
        { currentPassword, newPassword },
        {
          onSuccess: () => {
            form.reset(emptyPasswords);
            setMessage({
              tone: 'ok',
              text: 'Password changed. You stay signed in here; every other device was signed out.',
            });
          },
          onError: (e) => setMessage({ tone: 'error', text: applyServerErrors(form, e) }),
        },
      ),
    )();
  };

  return (
    <Card testID="change-password">
      <T variant="subheading">Change password</T>
      {message ? (
        <Notice tone={message.tone} testID="password-message">
          {message.text}
        </Notice>
      ) : null}
      <FormTextField
        control={form.control}
        name="currentPassword"
        label="Current password"
        testID="current-password"
        secureTextEntry
        autoComplete="current-password"
      />
      <View style={styles.fieldRow}>
        <FormTextField
          control={form.control}
          name="newPassword"
          label="New password"
          testID="new-password"
          secureTextEntry
          autoComplete="new-password"
          hint="At least 10 characters"
          containerStyle={styles.fieldInRow}
        />
        <FormTextField
          control={form.control}
          name="confirm"
          label="New password again"
          testID="confirm-password"
          secureTextEntry
          autoComplete="new-password"
          onSubmitEditing={submit}
          containerStyle={styles.fieldInRow}
        />
      </View>
      <View style={styles.buttonRow}>
        <Button title="Change password" testID="change-password-submit" busy={change.isPending} onPress={submit} />
      </View>
    </Card>
  );
}

/** The signed-in person's own account: who they are, their password, signing out. */
/** The user's unit system for lengths on screen (the editor, the spot check, the results); labels keep theirs. */
function Units() {
  const { system, chosen, setSystem, error } = useUnitSystem();
  return (
    <Card testID="account-units">
      <T variant="subheading">Units</T>
      <Choice
        value={system}
        onChange={setSystem}
        testID="units"
        options={[
          { value: 'us', label: 'US customary (in, ft)' },
          { value: 'si', label: 'SI (mm, m)' },
        ]}
      />
      <T variant="small">
        {chosen
          ? 'Lengths in the model editor, the spot check and the results are shown in these units, on every device you sign in on. Values are stored in SI, so switching never changes them.'
          : 'Until you choose, lengths follow your organization’s label units. Values are stored in SI, so switching never changes them.'}
      </T>
      {error ? <Notice tone="error">{`Your choice was not saved: ${error}`}</Notice> : null}
    </Card>
  );
}

export function AccountScreen() {
  const user = useUser();
  const can = useCan();
  const me = useMe();
  const { signOut } = useSession();
  return (
    <Screen title="Account" subtitle="Your sign-in, units and password.">
      <Card testID="account-details">
        <T variant="subheading">{user.name}</T>
        <View>
          <ValueRow label="E-mail">
            <T style={styles.email}>{user.email}</T>
          </ValueRow>
          <ValueRow label="Role">
            <T style={styles.value}>{ROLE_LABELS[user.role]}</T>
          </ValueRow>
          {me.data ? (
            <ValueRow label="Organization">
              <T style={styles.value}>{me.data.organization.name}</T>
            </ValueRow>
          ) : null}
        </View>
        {!can('manageUsers') ? <T variant="small">An administrator changes names and roles.</T> : null}
      </Card>
      <Units />
      <ChangePassword />
      <Card>
        <T variant="subheading">Sign out</T>
        <T variant="small">Ends the session on this device. On a shared tablet, sign out when you are done.</T>
        <View style={styles.buttonRow}>
          <Button title="Sign out" kind="secondary" testID="account-sign-out" onPress={() => void signOut()} />
        </View>
      </Card>
    </Screen>
  );
}

const styles = StyleSheet.create({
  fieldRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  fieldInRow: { flexGrow: 1, flexBasis: 220 },
  buttonRow: { flexDirection: 'row' },
  email: { fontFamily: fonts.numbers, fontSize: 15 },
  value: { fontSize: 15 },
});
