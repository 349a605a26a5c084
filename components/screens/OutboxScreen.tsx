import React, { useState } from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import type { OutboxMessage } from '../../shared/schemas/reminders';
import { fmtDateTime } from '../../hooks/dates';
import { useOutbox } from '../../hooks/mail';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Card, Empty, Loading, Notice, Pill, QueryError, Screen, T, ValueRow } from '../ui';

const KIND_WORD: Record<string, string> = {
  reminder: 'Reminder',
  invitation: 'Invitation',
  'password-reset': 'Password reset',
};
const kindWord = (k: string) => KIND_WORD[k] ?? k;

function MessageView({ m, onBack }: { m: OutboxMessage; onBack?: () => void }) {
  return (
    <Card testID="outbox-message">
      {onBack ? (
        <View style={styles.backRow}>
          <Button title="← All messages" kind="quiet" onPress={onBack} testID="outbox-back" />
        </View>
      ) : null}
      <View style={styles.messageHead}>
        <T variant="heading" style={styles.subject} testID="outbox-subject">
          {m.subject}
        </T>
        <Pill label={kindWord(m.kind)} tone="accent" />
      </View>
      <View>
        <ValueRow label="From">
          <T style={styles.value}>{m.from}</T>
        </ValueRow>
        <ValueRow label="To">
          <T style={styles.recipients}>{m.to.join(', ')}</T>
        </ValueRow>
        <ValueRow label="Captured">
          <T style={styles.captured}>{fmtDateTime(m.receivedAt)}</T>
        </ValueRow>
      </View>
      {/* A long message scrolls in its own region: focusable and named, so a keyboard can reach and scroll it (axe:
          scrollable-region-focusable). */}
      <ScrollView horizontal={false} focusable aria-label="Message text" style={styles.messageScroll}>
        <T testID="outbox-text" selectable style={styles.messageText}>
          {m.text}
        </T>
      </ScrollView>
    </Card>
  );
}

function MessageRow({ m, on, onPress }: { m: OutboxMessage; on: boolean; onPress: () => void }) {
  return (
    <Pressable
      accessibilityRole="button"
      aria-pressed={on}
      onPress={onPress}
      testID={`outbox-row-${m.id}`}
      style={({ pressed }) => [styles.row, on ? styles.rowOn : pressed ? styles.rowPressed : null]}
    >
      <View style={styles.rowHead}>
        <T style={styles.rowSubject} numberOfLines={1}>
          {m.subject}
        </T>
        <T variant="small" style={styles.rowWhen}>
          {fmtDateTime(m.receivedAt).slice(0, 16)}
        </T>
      </View>
      <T variant="small" numberOfLines={1}>
        {kindWord(m.kind)} · to {m.to.join(', ')}
      </T>
    </Pressable>
  );
}

/** The mail the server sent or captured: for the administrator to check what went out (and, locally, to read it). */
export function OutboxScreen() {
  const { wide } = useLayout();
  const outbox = useOutbox();
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const messages = outbox.data?.messages ?? [];
  const selected = messages.find((m) => m.id === selectedId) ?? null;
  const shown = wide ? (selected ?? messages[0] ?? null) : selected;

  const list = (
    <View style={styles.list} testID="outbox-list">
      {messages.map((m) => (
        <MessageRow key={m.id} m={m} on={shown?.id === m.id} onPress={() => setSelectedId(m.id)} />
      ))}
    </View>
  );

  return (
    <Screen
      title="Outbox"
      subtitle="E-mail from Emberline to the organization: invitations, password links and reminders, newest first."
    >
      {outbox.data?.transport === 'local-sink' ? (
        <Notice tone="warning" title="Mail is captured here, not delivered" testID="outbox-local-sink">
          No mail server is set up for this installation: messages are kept on this server so they can be read here, and
          nobody receives them. Set up SMTP delivery to send them.
        </Notice>
      ) : null}
      {outbox.data?.transport === 'smtp' ? (
        <Notice testID="outbox-smtp">Messages are delivered through the mail server; copies are listed here.</Notice>
      ) : null}
      <QueryError error={outbox.error} title="The outbox could not be loaded" />
      {outbox.isLoading ? <Loading what="Loading messages…" /> : null}
      {outbox.data && messages.length === 0 ? (
        <Empty title="No messages yet" testID="outbox-empty">
          Invitations, password-reset links and reminder e-mails appear here as they are sent.
        </Empty>
      ) : null}
      {messages.length > 0 && wide ? (
        <View style={styles.split}>
          <View style={styles.listColumn}>{list}</View>
          <View style={styles.messageColumn}>{shown ? <MessageView m={shown} /> : null}</View>
        </View>
      ) : null}
      {messages.length > 0 && !wide ? (
        shown ? (
          <MessageView m={shown} onBack={() => setSelectedId(null)} />
        ) : (
          list
        )
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: {
    minHeight: touch.min + 12,
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    gap: 2,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: 'transparent',
    backgroundColor: colors.surface,
  },
  /** The message shown beside the list. */
  rowOn: { borderLeftColor: colors.accent, backgroundColor: colors.accentSoft },
  rowPressed: { backgroundColor: colors.canvas },
  backRow: { flexDirection: 'row' },
  messageHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, flexWrap: 'wrap' },
  subject: { flexShrink: 1 },
  value: { fontSize: 15 },
  recipients: { fontSize: 15, textAlign: 'right' },
  captured: { fontSize: 15, fontFamily: fonts.numbers },
  messageScroll: { maxHeight: 640 },
  messageText: { fontFamily: fonts.numbers, fontSize: 14, lineHeight: 21, color: colors.ink },
  rowHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm },
  rowSubject: { fontFamily: fonts.textMedium, fontSize: 15, flexShrink: 1 },
  rowWhen: { fontFamily: fonts.numbers, fontSize: 12, flexShrink: 0 },
  list: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    overflow: 'hidden',
  },
  split: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  listColumn: { flex: 1 },
  messageColumn: { flex: 1.4 },
});
