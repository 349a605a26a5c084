import type { AppHref } from '../nav';
import { Link } from 'expo-router';
import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { Role } from '../../shared/schemas/common';
import { ROLE_LABELS } from '../../shared/schemas/common';
import { useAttentionSummary } from '../../hooks/attention';
import { useMe, useSites, useUsers } from '../../hooks/queries';
import { useUser } from '../../hooks/session';
import { useLayout } from '../../hooks/useLayout';
import { colors, radius, space, touch, fonts } from '../theme';
import { Card, Loading, Num, QueryError, Screen, T } from '../ui';
import { AttentionCards, AttentionCaution, OpenReportAges } from './AttentionScreen';

interface Step {
  title: string;
  detail: string;
  href: AppHref;
}

/**
 * What each role does, where it goes next, and what its home shows first: the attention summary (the safety officer's
 * audit) and the team by role (the administrator's people).
 */
const ROLE_HOME: Record<Role, { duty: string; steps: Step[]; attention?: boolean; team?: boolean }> = {
  engineer: {
    duty: 'Model each site, compute fault and arcing currents, read clearing times from the trip bands, and approve the labels.',
    steps: [
      { title: 'Open a site', detail: 'Its equipment, studies and revisions', href: '/sites' },
      { title: 'Add a site', detail: 'Start the model of a new facility', href: '/sites?new=1' },
      { title: 'Field reports', detail: 'Acknowledge and resolve what the field reports', href: '/reports' },
    ],
  },
  electrician: {
    duty: 'Print approved labels, put them on the equipment, check them in the field and report what does not match.',
    steps: [
      { title: 'Sites', detail: 'Approved studies and their equipment', href: '/sites' },
      { title: 'My reports', detail: 'What you reported and where it stands', href: '/reports' },
    ],
  },
  safety: {
    attention: true,
    duty: 'Audit: studies nearing review, labels superseded but still installed, labels not yet installed, open field reports.',
    steps: [
      { title: 'Field reports', detail: 'Acknowledge and resolve mismatches from the field', href: '/reports' },
      { title: 'Audit log', detail: 'Who changed what, and when', href: '/audit-log' },
      { title: 'Reminders', detail: 'Who is e-mailed about which lists', href: '/reminders' },
    ],
  },
  admin: {
    team: true,
    duty: 'Manage the organization: people, roles and settings.',
    steps: [
      { title: 'Team', detail: 'Invite people, change roles, deactivate', href: '/team' },
      { title: 'Sites', detail: 'Sites of the organization', href: '/sites' },
      { title: 'Outbox', detail: 'Invitations, password links and reminders sent', href: '/outbox' },
    ],
  },
};

function StepCard({ step, inRow }: { step: Step; inRow: boolean }) {
  return (
    <Link href={step.href} asChild>
      <Pressable accessibilityRole="link" style={inRow ? styles.stepInRow : styles.step}>
        <T variant="subheading">{step.title} →</T>
        <T variant="small">{step.detail}</T>
      </Pressable>
    </Link>
  );
}

function TeamSummary() {
  const users = useUsers();
  if (!users.data) return null;
  const counts = users.data.reduce<Record<string, number>>((acc, u) => {
    if (u.active) acc[u.role] = (acc[u.role] ?? 0) + 1;
    return acc;
  }, {});
  return (
    <Card testID="team-summary">
      <T variant="subheading">Active people by role</T>
      <View style={styles.roleCounts}>
        {(Object.keys(ROLE_LABELS) as Role[]).map((r) => (
          <View key={r} style={styles.roleCount}>
            <Num value={String(counts[r] ?? 0)} size={28} bold />
            <T variant="small">{ROLE_LABELS[r]}</T>
          </View>
        ))}
      </View>
    </Card>
  );
}

/** The safety officer's first view: the dashboard's counts, each opening its list. */
function AttentionHome() {
  const summary = useAttentionSummary(null);
  return (
    <View style={styles.attention} testID="home-attention">
      <View style={styles.attentionHead}>
        <T variant="heading">Needs attention</T>
        <Link href="/attention" style={styles.dashboardLink}>
          Open the dashboard →
        </Link>
      </View>
      <QueryError error={summary.error} title="The dashboard could not be loaded" />
      {summary.isLoading ? <Loading what="Counting what needs attention…" /> : null}
      {summary.data ? (
        <>
          <AttentionCards summary={summary.data} siteId={null} />
          <OpenReportAges summary={summary.data} siteId={null} />
        </>
      ) : null}
      <AttentionCaution />
    </View>
  );
}

export function HomeScreen() {
  const user = useUser();
  const me = useMe();
  const sites = useSites();
  const { wide } = useLayout();
  const home = ROLE_HOME[user.role];
  return (
    <Screen
      title={`Hello, ${user.name.split(' ')[0]}`}
      documentTitle="Home"
      subtitle={`${ROLE_LABELS[user.role]}${me.data ? ` · ${me.data.organization.name}` : ''}`}
    >
      <Card testID={`home-${user.role}`} style={styles.duty}>
        <T variant="label" style={styles.dutyRole}>
          YOUR ROLE: {ROLE_LABELS[user.role].toUpperCase()}
        </T>
        <T style={styles.dutyText}>{home.duty}</T>
      </Card>
      {home.attention ? <AttentionHome /> : null}
      <T variant="heading">Next</T>
      <View style={[styles.steps, wide && styles.stepsWide]}>
        {home.steps.map((s) => (
          <StepCard key={s.title} step={s} inRow={wide} />
        ))}
      </View>
      {home.team ? <TeamSummary /> : null}
      <Card>
        <T variant="subheading">Sites</T>
        {sites.isLoading ? <T variant="small">Loading…</T> : null}
        {sites.data?.length === 0 ? <T variant="small">No sites yet.</T> : null}
        {sites.data?.slice(0, 5).map((s) => (
          <Link key={s.id} href={`/sites/${s.id}`} style={styles.siteLink}>
            {s.name}
          </Link>
        ))}
      </Card>
    </Screen>
  );
}

/** A next-step card (the child of a `Link asChild`, so each style is one plain object). */
const step = {
  minHeight: touch.min + 16,
  flexGrow: 0,
  flexBasis: 'auto',
  backgroundColor: colors.surface,
  borderRadius: radius.lg,
  borderWidth: 1,
  borderColor: colors.line,
  padding: space.lg,
  gap: space.xs,
} as const;

const styles = StyleSheet.create({
  step,
  stepInRow: { ...step, flexGrow: 1, flexBasis: 260 },
  roleCounts: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xl },
  roleCount: { gap: 2 },
  attention: { gap: space.md },
  attentionHead: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'flex-end',
    flexWrap: 'wrap',
    gap: space.sm,
  },
  dashboardLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
  duty: { backgroundColor: colors.nav, borderColor: colors.nav },
  dutyRole: { color: colors.navMuted },
  dutyText: { color: colors.navInk, fontSize: 18, fontFamily: fonts.textMedium, lineHeight: 26 },
  steps: { gap: space.md },
  stepsWide: { flexDirection: 'row', flexWrap: 'wrap' },
  siteLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium, paddingVertical: 6 },
});
