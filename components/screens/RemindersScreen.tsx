import { Link } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ATTENTION_LIST_INFO, ATTENTION_LISTS, type AttentionList } from '../../shared/schemas/attention';
import { ROLE_LABELS, ROLES, type Role } from '../../shared/schemas/common';
import { reminderRuleInputSchema, type ReminderDelivery, type ReminderRule } from '../../shared/schemas/reminders';
import { fmtDateTime, fmtHourUtc } from '../../hooks/dates';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import {
  useApproveReminderEmails,
  useDeleteReminderRule,
  useDeliveries,
  useReminderRules,
  useSaveReminderRule,
  useSendNow,
} from '../../hooks/mail';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space } from '../theme';
import { FormChoice, FormMultiChoice, FormTextField } from '../form';
import { Button, Card, ConfirmButton, Empty, Loading, Notice, Pill, type PillTone, QueryError, Screen, T } from '../ui';

const listOptions = ATTENTION_LISTS.map((l) => ({ value: l, label: ATTENTION_LIST_INFO[l].title }));
const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

const DELIVERY_TONE: Record<ReminderDelivery['status'], PillTone> = {
  sending: 'accent',
  sent: 'ok',
  skipped: 'neutral',
  failed: 'danger',
};
const DELIVERY_WORD: Record<ReminderDelivery['status'], string> = {
  sending: 'Sending',
  sent: 'Sent',
  skipped: 'Skipped',
  failed: 'Failed',
};

interface Draft {
  name: string;
  lists: AttentionList[];
  roles: Role[];
  emails: string;
  enabled: 'on' | 'off';
  onlyWhenSomething: 'yes' | 'no';
}

const emptyDraft: Draft = {
  name: '',
  lists: ['review-overdue', 'superseded-installed', 'open-reports'],
  roles: ['safety'],
  emails: '',
  enabled: 'on',
  onlyWhenSomething: 'yes',
};

function draftOf(r: ReminderRule): Draft {
  return {
    name: r.name,
    lists: [...r.lists],
    roles: [...r.roles],
    emails: r.emails.join(', '),
    enabled: r.enabled ? 'on' : 'off',
    onlyWhenSomething: r.onlyWhenSomething ? 'yes' : 'no',
  };
}

/** The rule as the schema takes it: the addresses split, the choices as booleans (a message on `emails[2]` shows under the addresses). */
function inputOf(d: Draft) {
  return {
    name: d.name,
    lists: d.lists,
    roles: d.roles,
    emails: d.emails
      .split(/[\s,;]+/)
      .map((e) => e.trim())
      .filter(Boolean),
    enabled: d.enabled === 'on',
    onlyWhenSomething: d.onlyWhenSomething === 'yes',
  };
}

function RuleForm({ rule, onDone }: { rule?: ReminderRule; onDone: () => void }) {
  const form = useZodForm<typeof reminderRuleInputSchema, Draft>(reminderRuleInputSchema, {
    defaultValues: rule ? draftOf(rule) : emptyDraft,
    toInput: inputOf,
  });
  const [message, setMessage] = useState<string | null>(null);
  const save = useSaveReminderRule();
  const submit = () => {
    setMessage(null);
    void form.handleSubmit((input) =>
      save.mutate(
        { id: rule?.id, input },
        {
          onSuccess: onDone,
          onError: (e) => setMessage(applyServerErrors(form, e)),
        },
      ),
    )();
  };
  return (
    <Card testID="rule-form">
      <T variant="subheading">{rule ? `Edit “${rule.name}”` : 'New reminder rule'}</T>
      {message ? <Notice tone="error">{message}</Notice> : null}
      <FormTextField
        control={form.control}
        name="name"
        label="Name"
        testID="rule-name"
        placeholder="e.g. Weekly safety round-up"
      />
      <FormMultiChoice
        control={form.control}
        name="lists"
        label="Lists to include"
        options={listOptions}
        testID="rule-lists"
      />
      <FormMultiChoice
        control={form.control}
        name="roles"
        label="Send to everyone with the role"
        options={roleOptions}
        testID="rule-roles"
      />
      <FormTextField
        control={form.control}
        name="emails"
        label="Further e-mail addresses"
        testID="rule-emails"
        autoCapitalize="none"
        hint="Separate several with commas. Addresses outside the organization are mailed once an administrator approves them."
        placeholder="contractor@example.org"
      />
      <View style={styles.choiceRow}>
        <FormChoice
          control={form.control}
          name="enabled"
          label="Rule"
          options={[
            { value: 'on', label: 'Enabled' },
            { value: 'off', label: 'Paused' },
          ]}
          testID="rule-enabled"
        />
        <FormChoice
          control={form.control}
          name="onlyWhenSomething"
          label="When every chosen list is empty"
          options={[
            { value: 'yes', label: 'Skip that day' },
            { value: 'no', label: 'Send anyway' },
          ]}
          testID="rule-only-when"
        />
      </View>
      <View style={styles.buttonRow}>
        <Button title={rule ? 'Save rule' : 'Create rule'} testID="rule-save" busy={save.isPending} onPress={submit} />
        <Button title="Cancel" kind="secondary" onPress={onDone} />
      </View>
    </Card>
  );
}

function deliveryLine(d: ReminderDelivery): string {
  const items = d.itemCount === 1 ? '1 item' : `${d.itemCount} items`;
  if (d.status === 'sent')
    return `${d.ruleName}: sent to ${d.recipients.join(', ') || 'nobody'} (${items})${d.message.includes('awaiting') ? ` — ${d.message}` : ''}.`;
  return `${d.ruleName}: ${DELIVERY_WORD[d.status].toLowerCase()} (${items})${d.message ? ` — ${d.message}` : ''}.`;
}

function RuleCard({
  rule,
  onEdit,
  onSent,
}: {
  rule: ReminderRule;
  onEdit: () => void;
  onSent: (d: ReminderDelivery[]) => void;
}) {
  const del = useDeleteReminderRule();
  const send = useSendNow();
  const approve = useApproveReminderEmails();
  const canApprove = useCan()('approveReminderEmails');
  const [error, setError] = useState<string | null>(null);
  const states = rule.emailStates ?? rule.emails.map((email) => ({ email, state: 'pending' as const }));
  const pending = states.filter((e) => e.state === 'pending').map((e) => e.email);
  const approvedOrMember = states.filter((e) => e.state !== 'pending').map((e) => e.email);
  return (
    <Card testID={`rule-${rule.name}`} style={rule.enabled ? undefined : styles.paused}>
      <View style={styles.ruleHead}>
        <T variant="subheading" style={styles.ruleName}>
          {rule.name}
        </T>
        <Pill label={rule.enabled ? 'Enabled' : 'Paused'} tone={rule.enabled ? 'ok' : 'neutral'} />
      </View>
      <View style={styles.ruleFact}>
        <T variant="label">LISTS</T>
        <T style={styles.factText}>{rule.lists.map((l) => ATTENTION_LIST_INFO[l].title).join(' · ')}</T>
      </View>
      <View style={styles.ruleFact}>
        <T variant="label">TO</T>
        <T style={styles.factText}>
          {[...rule.roles.map((r) => `every ${ROLE_LABELS[r].toLowerCase()}`), ...approvedOrMember].join(', ') || '—'}
        </T>
      </View>
      {pending.length ? (
        <Notice testID={`rule-pending-${rule.name}`} title="Awaiting an administrator's approval">
          <View style={styles.pendingBody}>
            <T>
              Addresses outside the organization get no reminder until an administrator approves them:{' '}
              {pending.join(', ')}.
            </T>
            {canApprove ? (
              <View style={styles.approveRow}>
                <Button
                  title={pending.length === 1 ? 'Approve the address' : `Approve ${pending.length} addresses`}
                  kind="secondary"
                  testID={`rule-approve-${rule.name}`}
                  busy={approve.isPending}
                  onPress={() => {
                    setError(null);
                    approve.mutate(
                      { id: rule.id, emails: pending },
                      { onError: (e) => setError(serverErrors(e).message) },
                    );
                  }}
                />
              </View>
            ) : null}
          </View>
        </Notice>
      ) : null}
      <T variant="small">
        {rule.onlyWhenSomething
          ? 'Skips the days when every chosen list is empty.'
          : 'Sent every day, even when the lists are empty.'}{' '}
        Last sent: {rule.lastSentAt ? fmtDateTime(rule.lastSentAt) : 'never'}.
      </T>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <View style={styles.ruleActions}>
        <Button
          title="Send now"
          testID={`rule-send-${rule.name}`}
          busy={send.isPending}
          onPress={() => {
            setError(null);
            send.mutate(rule.id, {
              onSuccess: (r) => onSent(r.deliveries),
              onError: (e) => setError(serverErrors(e).message),
            });
          }}
        />
        <Button title="Edit" kind="secondary" testID={`rule-edit-${rule.name}`} onPress={onEdit} />
        <ConfirmButton
          title="Delete"
          question={`Delete the rule “${rule.name}”? Its past deliveries stay in the list below.`}
          busy={del.isPending}
          testID={`rule-delete-${rule.name}`}
          onConfirm={() => del.mutate(rule.id, { onError: (e) => setError(serverErrors(e).message) })}
        />
      </View>
    </Card>
  );
}

function Deliveries() {
  const { wide } = useLayout();
  const deliveries = useDeliveries();
  return (
    <View style={styles.section}>
      <T variant="heading">Recent deliveries</T>
      <QueryError error={deliveries.error} />
      {deliveries.isLoading ? <Loading what="Loading deliveries…" /> : null}
      {deliveries.data && deliveries.data.length === 0 ? (
        <Empty title="Nothing sent yet" testID="deliveries-empty">
          Each daily run and each “Send now” is listed here: whom it went to, how many items it carried, or why it was
          skipped.
        </Empty>
      ) : null}
      {deliveries.data && deliveries.data.length ? (
        <View style={styles.deliveries} testID="deliveries">
          {deliveries.data.map((d) => (
            <View
              key={d.id}
              testID={`delivery-${d.id}`}
              style={[styles.delivery, wide ? styles.deliveryWide : styles.deliveryNarrow]}
            >
              <T style={[styles.deliveryWhen, wide && styles.deliveryWhenWide]}>{fmtDateTime(d.createdAt)}</T>
              <View style={wide ? styles.deliveryStatusWide : undefined}>
                <Pill label={DELIVERY_WORD[d.status]} tone={DELIVERY_TONE[d.status]} />
              </View>
              <View style={[styles.deliveryWhat, wide && styles.deliveryWhatWide]}>
                <T style={styles.deliveryRule}>
                  {d.ruleName} <T variant="small">({d.trigger === 'daily' ? 'daily' : 'sent by hand'})</T>
                </T>
                <T variant="small">
                  {d.itemCount === 1 ? '1 item' : `${d.itemCount} items`} ·{' '}
                  {d.recipients.length ? d.recipients.join(', ') : 'no recipients'}
                </T>
                {d.message && (d.status !== 'sent' || d.message.includes('awaiting')) ? (
                  <T variant="small">{d.message}</T>
                ) : null}
              </View>
            </View>
          ))}
        </View>
      ) : null}
    </View>
  );
}

/** Reminder rules (who is told about which lists, daily at the organization's hour), sending now, and what was sent. */
export function RemindersScreen() {
  const can = useCan();
  const rules = useReminderRules();
  const sendAll = useSendNow();
  const [editing, setEditing] = useState<ReminderRule | 'new' | null>(null);
  const [result, setResult] = useState<{ tone: 'ok' | 'error'; lines: string[] } | null>(null);
  const hour = rules.data?.reminderHourUtc;

  const showResult = (deliveries: ReminderDelivery[]) =>
    setResult({ tone: 'ok', lines: deliveries.length ? deliveries.map(deliveryLine) : ['No enabled rule to send.'] });

  return (
    <Screen
      title="Reminders"
      subtitle="E-mails that tell people what needs attention: which lists, and to whom."
      actions={
        <>
          {editing === null ? <Button title="New rule" testID="rule-new" onPress={() => setEditing('new')} /> : null}
          <Button
            title="Send all now"
            kind="secondary"
            testID="rules-send-all"
            busy={sendAll.isPending}
            disabled={!rules.data?.rules.some((r) => r.enabled)}
            onPress={() => {
              setResult(null);
              sendAll.mutate(undefined, {
                onSuccess: (r) => showResult(r.deliveries),
                onError: (e) => setResult({ tone: 'error', lines: [serverErrors(e).message] }),
              });
            }}
          />
        </>
      }
    >
      {hour !== undefined ? (
        <Notice testID="reminder-hour">
          <T>
            Enabled rules run every day at <T style={styles.hour}>{fmtHourUtc(hour)}</T>.{' '}
            {can('manageSettings') ? (
              <Link href="/settings" style={styles.link}>
                Change the hour in Settings
              </Link>
            ) : (
              'An administrator sets the hour in the organization settings.'
            )}
          </T>
        </Notice>
      ) : null}
      {result ? (
        <Notice tone={result.tone} title={result.tone === 'ok' ? 'Sent now' : 'Not sent'} testID="send-result">
          <View style={styles.sendLines}>
            {result.lines.map((l, i) => (
              <T key={i} style={result.tone === 'ok' ? styles.sentOk : styles.sentError}>
                {l}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}
      {editing === 'new' ? <RuleForm onDone={() => setEditing(null)} /> : null}
      <QueryError error={rules.error} title="The rules could not be loaded" />
      {rules.isLoading ? <Loading what="Loading reminder rules…" /> : null}
      {rules.data && rules.data.rules.length === 0 && editing === null ? (
        <Empty title="No reminder rules" testID="rules-empty">
          A rule e-mails the chosen lists (for example studies past review and open field reports) to everyone with a
          role, or to given addresses, once a day. Create one with “New rule”.
        </Empty>
      ) : null}
      <View style={styles.section}>
        {rules.data?.rules.map((r) =>
          editing !== null && editing !== 'new' && editing.id === r.id ? (
            <RuleForm key={r.id} rule={r} onDone={() => setEditing(null)} />
          ) : (
            <RuleCard key={r.id} rule={r} onEdit={() => setEditing(r)} onSent={showResult} />
          ),
        )}
      </View>
      <Deliveries />
    </Screen>
  );
}

const styles = StyleSheet.create({
  paused: { opacity: 0.8 },
  sentOk: { color: colors.ok },
  sentError: { color: colors.danger },
  choiceRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.lg },
  buttonRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  ruleHead: { flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm },
  ruleName: { flexShrink: 1 },
  ruleFact: { gap: space.xs },
  factText: { fontSize: 15 },
  pendingBody: { gap: space.sm },
  approveRow: { flexDirection: 'row' },
  ruleActions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'flex-start' },
  section: { gap: space.md },
  deliveries: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
  },
  delivery: {
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  deliveryWide: { flexDirection: 'row', gap: space.md },
  deliveryNarrow: { gap: space.xs },
  deliveryWhenWide: { width: 175 },
  deliveryStatusWide: { width: 90 },
  deliveryWhatWide: { flex: 1 },
  deliveryWhen: { fontFamily: fonts.numbers, fontSize: 13, color: colors.inkSoft },
  deliveryWhat: { gap: 2 },
  deliveryRule: { fontSize: 15, fontFamily: fonts.textMedium },
  hour: { fontFamily: fonts.numbersBold },
  link: { color: colors.accent },
  sendLines: { gap: 2 },
});
