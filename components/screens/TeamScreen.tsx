import React, { useState } from 'react';
import { View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '../../shared/schemas/common';
import { createUserSchema, type UserAdmin } from '../../shared/schemas/users';
import { serverErrors, validate } from '../../hooks/forms';
import { useCreateUser, useUpdateUser, useUsers } from '../../hooks/queries';
import { useUser } from '../../hooks/session';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, space } from '../theme';
import { Button, Card, Choice, Field, Notice, Screen, T } from '../ui';

const inRow = { flexGrow: 1, flexBasis: 220 } as const;
const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

function NewUserForm({ onDone }: { onDone: () => void }) {
  const [form, setForm] = useState({ email: '', name: '', role: 'electrician' as Role, password: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const create = useCreateUser();
  const set = (k: keyof typeof form) => (v: string) => setForm((f) => ({ ...f, [k]: v }));
  const submit = () => {
    const v = validate(createUserSchema, form);
    if (!v.ok) return setErrors(v.errors);
    setErrors({});
    create.mutate(v.data, {
      onSuccess: onDone,
      onError: (e) => {
        const s = serverErrors(e);
        setMessage(s.message);
        setErrors(s.fields);
      },
    });
  };
  return (
    <Card testID="new-user-form">
      <T variant="subheading">Add a person</T>
      {message ? <Notice tone="error">{message}</Notice> : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <Field label="Name" testID="user-name" value={form.name} onChangeText={set('name')} error={errors.name} containerStyle={inRow} />
        <Field label="E-mail" testID="user-email" value={form.email} onChangeText={set('email')} autoCapitalize="none" error={errors.email} containerStyle={inRow} />
        <Field label="Initial password" testID="user-password" value={form.password} onChangeText={set('password')} secureTextEntry error={errors.password} hint="At least 10 characters" containerStyle={inRow} />
      </View>
      <Choice label="Role" value={form.role} options={roleOptions} onChange={(r) => setForm((f) => ({ ...f, role: r }))} testID="user-role" />
      <View style={{ flexDirection: 'row', gap: space.sm }}>
        <Button title="Add person" testID="user-create" busy={create.isPending} onPress={submit} />
        <Button title="Cancel" kind="secondary" onPress={onDone} />
      </View>
    </Card>
  );
}

function UserRow({ u, self }: { u: UserAdmin; self: boolean }) {
  const update = useUpdateUser();
  const [error, setError] = useState<string | null>(null);
  const change = (input: { role?: Role; active?: boolean }) =>
    update.mutate({ id: u.id, ...input }, { onError: (e) => setError(serverErrors(e).message), onSuccess: () => setError(null) });
  return (
    <Card testID={`user-${u.email}`} style={{ opacity: u.active ? 1 : 0.7 }}>
      <View style={{ flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm }}>
        <View style={{ gap: 2 }}>
          <T variant="subheading">
            {u.name}
            {self ? ' (you)' : ''}
          </T>
          <T variant="small" style={{ fontFamily: fonts.numbers }}>{u.email}</T>
        </View>
        <T style={{ color: u.active ? colors.ok : colors.danger, fontFamily: fonts.textBold }}>{u.active ? 'Active' : 'Deactivated'}</T>
      </View>
      {error ? <Notice tone="error">{error}</Notice> : null}
      {!self ? (
        <>
          <Choice value={u.role} options={roleOptions} onChange={(role) => change({ role })} testID={`role-${u.email}`} />
          <View style={{ flexDirection: 'row' }}>
            <Button
              title={u.active ? 'Deactivate' : 'Reactivate'}
              kind={u.active ? 'danger' : 'secondary'}
              busy={update.isPending}
              onPress={() => change({ active: !u.active })}
              testID={`toggle-${u.email}`}
            />
          </View>
        </>
      ) : (
        <T variant="small">{ROLE_LABELS[u.role]}</T>
      )}
    </Card>
  );
}

export function TeamScreen() {
  const me = useUser();
  const users = useUsers();
  const { wide } = useLayout();
  const [adding, setAdding] = useState(false);
  return (
    <Screen
      title="Team"
      subtitle="People of the organization, their roles, and who may sign in."
      actions={!adding ? <Button title="Add a person" testID="add-user" onPress={() => setAdding(true)} /> : null}
    >
      {adding ? <NewUserForm onDone={() => setAdding(false)} /> : null}
      {users.error ? <Notice tone="error">{users.error.message}</Notice> : null}
      <View style={{ flexDirection: wide ? 'row' : 'column', flexWrap: 'wrap', gap: space.md }}>
        {users.data?.map((u) => (
          <View key={u.id} style={{ flexBasis: wide ? '48%' : 'auto', flexGrow: 1 }}>
            <UserRow u={u} self={u.id === me.id} />
          </View>
        ))}
      </View>
    </Screen>
  );
}
