import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '../../shared/schemas/common';
import { createInvitationSchema, type InvitationDto } from '../../shared/schemas/invitations';
import { createUserSchema, type UserAdmin } from '../../shared/schemas/users';
import { fmtDate } from '../../hooks/dates';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import { useCreateInvitation, useInvitations, useResendInvitation, useRevokeInvitation } from '../../hooks/mail';
import { useCreateUser, useUpdateUser, useUsers } from '../../hooks/queries';
import { useUser } from '../../hooks/session';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, space } from '../theme';
import { FormChoice, FormTextField } from '../form';
import {
  Button,
  Card,
  Choice,
  ConfirmButton,
  Empty,
  Loading,
  Notice,
  Pill,
  type PillTone,
  QueryError,
  Screen,
  T,
} from '../ui';

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

function NewUserForm({ onDone }: { onDone: () => void }) {
  const form = useZodForm(createUserSchema, {
    defaultValues: { email: '', name: '', role: 'electrician' as Role, password: '' },
  });
  const [message, setMessage] = useState<string | null>(null);
  const create = useCreateUser();
  const submit = () =>
    void form.handleSubmit((data) =>
      create.mutate(data, {
        onSuccess: onDone,
        onError: (e) => setMessage(applyServerErrors(form, e)),
      }),
    )();
  return (
    <Card testID="new-user-form">
      <T variant="subheading">Add a person</T>
      {message ? <Notice tone="error">{message}</Notice> : null}
      <View style={styles.fieldRow}>
        <FormTextField
          control={form.control}
          name="name"
          label="Name"
          testID="user-name"
          containerStyle={styles.fieldInRow}
        />
        <FormTextField
          control={form.control}
          name="email"
          label="E-mail"
          testID="user-email"
          autoCapitalize="none"
          containerStyle={styles.fieldInRow}
        />
        <FormTextField
          control={form.control}
          name="password"
          label="Initial password"
          testID="user-password"
          secureTextEntry
          hint="At least 10 characters"
          containerStyle={styles.fieldInRow}
        />
      </View>
      <FormChoice control={form.control} name="role" label="Role" options={roleOptions} testID="user-role" />
      <View style={styles.buttonRow}>
        <Button title="Add person" testID="user-create" busy={create.isPending} onPress={submit} />
        <Button title="Cancel" kind="secondary" onPress={onDone} />
      </View>
    </Card>
  );
}

function InviteForm({ onDone, onSent }: { onDone: () => void; onSent: (i: InvitationDto) => void }) {
  const form = useZodForm(createInvitationSchema, {
    defaultValues: { email: '', name: '', role: 'electrician' as Role },
  });
  const [message, setMessage] = useState<string | null>(null);
  const invite = useCreateInvitation();
  const submit = () => {
    setMessage(null);
    void form.handleSubmit((data) =>
      invite.mutate(data, {
        onSuccess: (i) => {
          onSent(i);
          onDone();
        },
        onError: (e) => setMessage(applyServerErrors(form, e)),
      }),
    )();
  };
  return (
    <Card testID="invite-form">
      <T variant="subheading">Invite someone</T>
      <T variant="small">
        They get an e-mail with a link to choose their own password. The link works for 7 days, once.
      </T>
      {message ? <Notice tone="error">{message}</Notice> : null}
      <View style={styles.fieldRow}>
        <FormTextField
          control={form.control}
          name="name"
          label="Name"
          testID="invite-name"
          containerStyle={styles.fieldInRow}
        />
        <FormTextField
          control={form.control}
          name="email"
          label="E-mail"
          testID="invite-email"
          autoCapitalize="none"
          inputMode="email"
          containerStyle={styles.fieldInRow}
        />
      </View>
      <FormChoice control={form.control} name="role" label="Role" options={roleOptions} testID="invite-role" />
      <View style={styles.buttonRow}>
        <Button title="Send invitation" testID="invite-send" busy={invite.isPending} onPress={submit} />
        <Button title="Cancel" kind="secondary" onPress={onDone} />
      </View>
    </Card>
  );
}

const INVITATION_STATUS: Record<InvitationDto['status'], { word: string; tone: PillTone }> = {
  pending: { word: 'Pending', tone: 'accent' },
  accepted: { word: 'Accepted', tone: 'ok' },
  expired: { word: 'Expired', tone: 'neutral' },
  revoked: { word: 'Revoked', tone: 'neutral' },
};

function InvitationRow({ i }: { i: InvitationDto }) {
  const resend = useResendInvitation();
  const revoke = useRevokeInvitation();
  const [note, setNote] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const st = INVITATION_STATUS[i.status];
  const open = i.status === 'pending' || i.status === 'expired';
  return (
    <View testID={`invitation-${i.email}`} style={styles.invitation}>
      <View style={styles.invitationHead}>
        <View style={styles.invitationWho}>
          <T style={styles.invitationName}>
            {i.name} · {ROLE_LABELS[i.role]}
          </T>
          <T variant="small" style={styles.email}>
            {i.email}
          </T>
          <T variant="small">
            Invited {fmtDate(i.createdAt)} by {i.invitedBy}
            {i.status === 'pending' ? ` · link works until ${fmtDate(i.expiresAt)}` : ''}
          </T>
        </View>
        <Pill label={st.word} tone={st.tone} testID={`invitation-status-${i.email}`} />
      </View>
      {note ? <Notice tone={note.tone}>{note.text}</Notice> : null}
      {open ? (
        <View style={styles.invitationActions}>
          <Button
            title="Send again"
            kind="secondary"
            testID={`invitation-resend-${i.email}`}
            busy={resend.isPending}
            onPress={() =>
              resend.mutate(i.id, {
                onSuccess: () =>
                  setNote({ tone: 'ok', text: 'Sent again with a new link; the earlier link no longer works.' }),
                onError: (e) => setNote({ tone: 'error', text: serverErrors(e).message }),
              })
            }
          />
          {i.status === 'pending' ? (
            <ConfirmButton
              title="Revoke"
              question={`Revoke the invitation of ${i.email}? The link stops working.`}
              busy={revoke.isPending}
              testID={`invitation-revoke-${i.email}`}
              onConfirm={() =>
                revoke.mutate(i.id, { onError: (e) => setNote({ tone: 'error', text: serverErrors(e).message }) })
              }
            />
          ) : null}
        </View>
      ) : null}
    </View>
  );
}

function Invitations({ inviting, setInviting }: { inviting: boolean; setInviting: (v: boolean) => void }) {
  const invitations = useInvitations();
  const [sent, setSent] = useState<InvitationDto | null>(null);
  const list = invitations.data ?? [];
  const pending = list.filter((i) => i.status === 'pending');
  const others = list.filter((i) => i.status !== 'pending' && i.status !== 'accepted');
  return (
    <View style={styles.invitations}>
      {inviting ? <InviteForm onDone={() => setInviting(false)} onSent={setSent} /> : null}
      {sent ? (
        <Notice tone="ok" testID="invite-sent">
          {`Invitation sent to ${sent.email}. It shows as pending until they set their password.`}
        </Notice>
      ) : null}
      <Card testID="invitations">
        <T variant="subheading">Invitations</T>
        <QueryError error={invitations.error} />
        {invitations.isLoading ? <Loading what="Loading invitations…" /> : null}
        {invitations.data && pending.length === 0 && others.length === 0 ? (
          <Empty title="No open invitations" testID="invitations-empty">
            Invite someone to let them set their own password. Pending, expired and revoked invitations are listed here.
          </Empty>
        ) : null}
        <View>
          {[...pending, ...others].map((i) => (
            <InvitationRow key={i.id} i={i} />
          ))}
        </View>
      </Card>
    </View>
  );
}

function UserRow({ u, self }: { u: UserAdmin; self: boolean }) {
  const update = useUpdateUser();
  const [error, setError] = useState<string | null>(null);
  const change = (input: { role?: Role; active?: boolean }) =>
    update.mutate(
      { id: u.id, ...input },
      { onError: (e) => setError(serverErrors(e).message), onSuccess: () => setError(null) },
    );
  return (
    <Card testID={`user-${u.email}`} style={u.active ? undefined : styles.deactivated}>
      <View style={styles.userHead}>
        <View style={styles.userWho}>
          <T variant="subheading">
            {u.name}
            {self ? ' (you)' : ''}
          </T>
          <T variant="small" style={styles.email}>
            {u.email}
          </T>
        </View>
        <T style={[styles.userState, u.active ? styles.active : styles.inactive]}>
          {u.active ? 'Active' : 'Deactivated'}
        </T>
      </View>
      {error ? <Notice tone="error">{error}</Notice> : null}
      {!self ? (
        <>
          <Choice
            value={u.role}
            options={roleOptions}
            onChange={(role) => change({ role })}
            testID={`role-${u.email}`}
          />
          <View style={styles.actionRow}>
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
  const [inviting, setInviting] = useState(false);
  return (
    <Screen
      title="Team"
      subtitle="People of the organization, their roles, and who may sign in."
      actions={
        <>
          {!inviting ? <Button title="Invite someone" testID="invite-user" onPress={() => setInviting(true)} /> : null}
          {!adding ? (
            <Button title="Add a person" kind="secondary" testID="add-user" onPress={() => setAdding(true)} />
          ) : null}
        </>
      }
    >
      {adding ? <NewUserForm onDone={() => setAdding(false)} /> : null}
      <Invitations inviting={inviting} setInviting={setInviting} />
      <T variant="heading">People</T>
      {users.error ? <Notice tone="error">{users.error.message}</Notice> : null}
      <View style={[styles.userList, wide && styles.userListWide]}>
        {users.data?.map((u) => (
          <View key={u.id} style={[styles.userCell, wide && styles.userCellWide]}>
            <UserRow u={u} self={u.id === me.id} />
          </View>
        ))}
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  fieldInRow: { flexGrow: 1, flexBasis: 220 },
  deactivated: { opacity: 0.7 },
  userState: { fontFamily: fonts.textBold },
  active: { color: colors.ok },
  inactive: { color: colors.danger },
  fieldRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  buttonRow: { flexDirection: 'row', gap: space.sm },
  invitation: { gap: space.sm, paddingVertical: space.md, borderBottomWidth: 1, borderBottomColor: colors.lineSoft },
  invitationHead: { flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm },
  invitationWho: { gap: 2, flexShrink: 1 },
  invitationName: { fontFamily: fonts.textMedium },
  email: { fontFamily: fonts.numbers },
  invitationActions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', alignItems: 'flex-start' },
  invitations: { gap: space.md },
  userHead: { flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm },
  userWho: { gap: 2 },
  actionRow: { flexDirection: 'row' },
  userList: { flexWrap: 'wrap', gap: space.md },
  /** Two people a row on a wide screen. */
  userListWide: { flexDirection: 'row' },
  userCell: { flexGrow: 1 },
  userCellWide: { flexBasis: '48%' },
});
