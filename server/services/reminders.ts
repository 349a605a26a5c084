import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import type { z } from 'zod';
import { log } from '../log';
import {
  ATTENTION_LIST_INFO,
  ATTENTION_LISTS,
  type AttentionList,
  type AttentionListResponse,
  type AttentionSummary,
} from '../../shared/schemas/attention';
import type { Role } from '../../shared/schemas/common';
import type {
  OutboxMessage,
  ReminderDelivery,
  ReminderEmailState,
  ReminderRule,
  ReminderRuleInput,
} from '../../shared/schemas/reminders';
import { reminderRuleInputSchema } from '../../shared/schemas/reminders';
import { CapturedMail, Organization, ReminderDeliveryRow, ReminderRuleRow, User } from '../db/models';
import type { AppContext, AuthUser } from './context';
import { ApiError } from './errors';
import { appLink, DIGEST_ROWS, reminderDigestMail, type DigestSection } from '../mail';
import { attentionList, attentionSummary } from './attention';
import { recordAudit } from './audit';
import { parseSettings } from './organization';

type RuleValues = z.output<typeof reminderRuleInputSchema>;

const parseArray = <T>(json: string): T[] => {
  try {
    const v: unknown = JSON.parse(json || '[]');
    return Array.isArray(v) ? (v as T[]) : [];
  } catch {
    return [];
  }
};

const clip = (s: string, max: number): string => (s.length > max ? `${s.slice(0, max - 1)}…` : s);

/** The UTC calendar day of a moment: the key of the daily delivery. */
export const utcDayKey = (d: Date): string => d.toISOString().slice(0, 10);

function valuesOf(row: ReminderRuleRow): RuleValues {
  return {
    name: row.name,
    enabled: row.enabled,
    lists: parseArray<AttentionList>(row.lists).filter((l) => (ATTENTION_LISTS as readonly string[]).includes(l)),
    roles: parseArray<Role>(row.roles),
    emails: parseArray<string>(row.emails),
    onlyWhenSomething: row.onlyWhenSomething,
  };
}

function toRule(row: ReminderRuleRow, lastSentAt: Date | null, members: Set<string>): ReminderRule {
  const values = valuesOf(row);
  return {
    id: row.id,
    ...values,
    emailStates: values.emails.map((email) => ({ email, state: emailState(row, email, members) })),
    lastSentAt: lastSentAt ? lastSentAt.toISOString() : null,
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** Addresses of the organization's active users (lower case): further addresses among them need no approval. */
async function memberEmails(organizationId: string, transaction?: Transaction): Promise<Set<string>> {
  const users = await User.findAll({ where: { organizationId, active: true }, attributes: ['email'], transaction });
  return new Set(users.map((u) => u.email.toLowerCase()));
}

/** A further address is mailed when it belongs to a user of the organization or an admin approved it. */
function emailState(row: ReminderRuleRow, email: string, members: Set<string>): ReminderEmailState {
  if (members.has(email.toLowerCase())) return 'member';
  return parseArray<string>(row.approvedEmails).includes(email.toLowerCase()) ? 'approved' : 'pending';
}

function toDelivery(row: ReminderDeliveryRow): ReminderDelivery {
  return {
    id: row.id,
    ruleId: row.ruleId,
    ruleName: row.ruleName,
    trigger: row.trigger,
    status: row.status,
    recipients: parseArray<string>(row.recipients),
    itemCount: row.itemCount,
    message: row.message,
    createdAt: row.createdAt.toISOString(),
  };
}

async function lastSent(ruleId: string): Promise<Date | null> {
  const row = await ReminderDeliveryRow.findOne({
    where: { ruleId, status: 'sent' },
    order: [['createdAt', 'DESC']],
    attributes: ['createdAt'],
  });
  return row?.createdAt ?? null;
}

async function findRule(actor: AuthUser, ruleId: string, transaction?: Transaction): Promise<ReminderRuleRow> {
  const row = await ReminderRuleRow.findOne({
    where: { id: ruleId, organizationId: actor.organizationId },
    transaction,
  });
  if (!row) throw ApiError.notFound('No such reminder rule');
  return row;
}

// ---------------------------------------------------------------- rules

export async function listRules(actor: AuthUser): Promise<{ rules: ReminderRule[]; reminderHourUtc: number }> {
  const rows = await ReminderRuleRow.findAll({
    where: { organizationId: actor.organizationId },
    order: [['name', 'ASC']],
  });
  const rules: ReminderRule[] = [];
  const members = await memberEmails(actor.organizationId);
  for (const r of rows) rules.push(toRule(r, await lastSent(r.id), members));
  const org = await Organization.findByPk(actor.organizationId, { attributes: ['settings'] });
  return { rules, reminderHourUtc: parseSettings(org?.settings ?? '{}').reminderHourUtc };
}

const stored = (v: RuleValues) => ({
  name: v.name,
  enabled: v.enabled,
  lists: JSON.stringify(v.lists),
  roles: JSON.stringify([...new Set(v.roles)]),
  emails: JSON.stringify([...new Set(v.emails)]),
  onlyWhenSomething: v.onlyWhenSomething,
});

/**
 * The approved outside addresses after a save: those approved before and still on the rule, plus, when an admin saves,
 * the addresses the admin added (an admin adding an address approves it). A safety officer's new addresses wait.
 */
function approvalsAfterSave(
  actor: AuthUser | null,
  values: RuleValues,
  before: { emails: string[]; approved: string[] },
) {
  const emails = new Set(values.emails.map((e) => e.toLowerCase()));
  const approved = before.approved.filter((e) => emails.has(e));
  if (actor?.role === 'admin') {
    const had = new Set(before.emails.map((e) => e.toLowerCase()));
    for (const e of emails) if (!had.has(e) && !approved.includes(e)) approved.push(e);
  }
  return approved.sort();
}

async function insertRule(
  organizationId: string,
  actor: AuthUser | null,
  values: RuleValues,
  transaction: Transaction,
): Promise<ReminderRuleRow> {
  const actorId = actor?.id ?? null;
  const approvedEmails = JSON.stringify(approvalsAfterSave(actor, values, { emails: [], approved: [] }));
  const row = await ReminderRuleRow.create(
    { id: randomUUID(), organizationId, ...stored(values), approvedEmails },
    { transaction },
  );
  await recordAudit(
    {
      organizationId,
      actorId,
      action: 'reminder-rule.created',
      entityType: 'reminder-rule',
      entityId: row.id,
      summary: { ...valuesOf(row), approvedEmails: parseArray<string>(row.approvedEmails) },
    },
    transaction,
  );
  return row;
}

export async function createRule(ctx: AppContext, actor: AuthUser, input: RuleValues): Promise<ReminderRule> {
  const row = await ctx.db.sequelize.transaction((transaction) =>
    insertRule(actor.organizationId, actor, input, transaction),
  );
  return toRule(row, null, await memberEmails(actor.organizationId));
}

export async function updateRule(
  ctx: AppContext,
  actor: AuthUser,
  ruleId: string,
  input: RuleValues,
): Promise<ReminderRule> {
  const row = await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await findRule(actor, ruleId, transaction);
    const before = valuesOf(r);
    const approvedBefore = parseArray<string>(r.approvedEmails);
    const approved = approvalsAfterSave(actor, input, { emails: before.emails, approved: approvedBefore });
    await r.update({ ...stored(input), approvedEmails: JSON.stringify(approved) }, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'reminder-rule.updated',
        entityType: 'reminder-rule',
        entityId: r.id,
        summary: {
          before: { ...before, approvedEmails: approvedBefore },
          after: { ...valuesOf(r), approvedEmails: approved },
        },
      },
      transaction,
    );
    return r;
  });
  return toRule(row, await lastSent(row.id), await memberEmails(actor.organizationId));
}

/** An admin approves outside addresses of a rule: from then on reminders go to them too. */
export async function approveRuleEmails(
  ctx: AppContext,
  actor: AuthUser,
  ruleId: string,
  emails: string[],
): Promise<ReminderRule> {
  const row = await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await findRule(actor, ruleId, transaction);
    const onRule = new Set(valuesOf(r).emails.map((e) => e.toLowerCase()));
    const notOnRule = emails.filter((e) => !onRule.has(e.toLowerCase()));
    if (notOnRule.length)
      throw new ApiError('bad_request', `Not an address of this rule: ${notOnRule.join(', ')}`, {
        emails: `Not on the rule: ${notOnRule.join(', ')}`,
      });
    const approved = [
      ...new Set([...parseArray<string>(r.approvedEmails), ...emails.map((e) => e.toLowerCase())]),
    ].sort();
    await r.update({ approvedEmails: JSON.stringify(approved) }, { transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'reminder-rule.emails-approved',
        entityType: 'reminder-rule',
        entityId: r.id,
        summary: { name: r.name, approved: emails },
      },
      transaction,
    );
    return r;
  });
  return toRule(row, await lastSent(row.id), await memberEmails(actor.organizationId));
}

/** Deletes a rule; its past deliveries stay (they carry the rule's name). */
export async function deleteRule(ctx: AppContext, actor: AuthUser, ruleId: string): Promise<void> {
  await ctx.db.sequelize.transaction(async (transaction) => {
    const r = await findRule(actor, ruleId, transaction);
    const before = valuesOf(r);
    await r.destroy({ transaction });
    await recordAudit(
      {
        organizationId: actor.organizationId,
        actorId: actor.id,
        action: 'reminder-rule.deleted',
        entityType: 'reminder-rule',
        entityId: r.id,
        summary: { before },
      },
      transaction,
    );
  });
}

/**
 * The two rules a new organization starts with: safety officers get every list; engineers get what is theirs to act
 * on (reviews past or near due, stale studies, open field reports). Both skip the day when there is nothing.
 */
export async function seedDefaultReminderRules(organizationId: string, transaction?: Transaction): Promise<void> {
  const defaults: ReminderRuleInput[] = [
    { name: 'Safety officers: everything that needs attention', lists: [...ATTENTION_LISTS], roles: ['safety'] },
    {
      name: 'Engineers: reviews, stale studies and field reports',
      lists: ['review-overdue', 'review-due-30', 'stale-studies', 'open-reports'],
      roles: ['engineer'],
    },
  ];
  for (const d of defaults) {
    const values = reminderRuleInputSchema.parse(d);
    if (transaction) await insertRule(organizationId, null, values, transaction);
    else await ReminderRuleRow.sequelize!.transaction((t) => insertRule(organizationId, null, values, t));
  }
}

// ---------------------------------------------------------------- deliveries

export async function listDeliveries(actor: AuthUser): Promise<ReminderDelivery[]> {
  const rows = await ReminderDeliveryRow.findAll({
    where: { organizationId: actor.organizationId },
    order: [['createdAt', 'DESC']],
    limit: 100,
  });
  return rows.map(toDelivery);
}

/** The cells that identify a row in a reminder, per list (the whole row is one click away). */
const KEY_CELLS: Record<AttentionList, string[]> = {
  'review-overdue': ['study', 'revision', 'reviewBy', 'daysOverdue'],
  'review-due-30': ['study', 'revision', 'reviewBy', 'daysLeft'],
  'review-due-90': ['study', 'revision', 'reviewBy', 'daysLeft'],
  'stale-studies': ['study', 'revision', 'changedInRevision', 'modelChangedOn'],
  'superseded-installed': ['equipment', 'code', 'currentCode'],
  'not-installed': ['equipment', 'code', 'daysSinceIssue'],
  'open-reports': ['equipment', 'kind', 'status', 'ageDays'],
};

function digestRows(list: AttentionListResponse): DigestSection['rows'] {
  const wanted = KEY_CELLS[list.list].map((k) => list.columns.find((c) => c.key === k)).filter((c) => !!c);
  const columns = wanted.length ? wanted : list.columns.slice(0, 3);
  return list.rows.slice(0, DIGEST_ROWS).map((r) => ({
    siteName: r.siteName,
    cells: columns
      .filter((c) => r.cells[c.key] !== null && r.cells[c.key] !== undefined && r.cells[c.key] !== '')
      .map((c) => ({ label: c.label, value: String(r.cells[c.key]) })),
  }));
}

/** What a rule's reminder says, read at ctx.now(); summaries and lists are cached per organization for one run. */
interface DigestCache {
  summary?: Promise<AttentionSummary>;
  lists: Map<AttentionList, Promise<AttentionListResponse>>;
}

async function buildDigest(
  ctx: AppContext,
  organizationId: string,
  organizationName: string,
  rule: RuleValues,
  day: string,
  cache: DigestCache,
) {
  cache.summary ??= attentionSummary(ctx, organizationId);
  const summary = await cache.summary;
  const sections: DigestSection[] = [];
  let itemCount = 0;
  for (const list of rule.lists) {
    const count = summary.counts[list] ?? 0;
    itemCount += count;
    let rows: DigestSection['rows'] = [];
    if (count > 0) {
      if (!cache.lists.has(list)) cache.lists.set(list, attentionList(ctx, organizationId, list));
      rows = digestRows(await cache.lists.get(list)!);
    }
    sections.push({
      title: ATTENTION_LIST_INFO[list].title,
      count,
      rows,
      link: appLink(ctx.config.publicBaseUrl, `attention/${list}`),
    });
  }
  return {
    itemCount,
    content: reminderDigestMail({ organizationName, ruleName: rule.name, day, itemCount, sections }),
  };
}

/**
 * Every active user of the rule's roles in the organization, plus its further addresses that belong to a user of the
 * organization or that an admin approved; each once. `pending`: outside addresses awaiting approval (not mailed).
 */
async function recipientsOf(
  organizationId: string,
  row: ReminderRuleRow,
  rule: RuleValues,
): Promise<{ recipients: string[]; pending: string[] }> {
  const users = rule.roles.length
    ? await User.findAll({ where: { organizationId, role: rule.roles, active: true }, attributes: ['email'] })
    : [];
  const members = await memberEmails(organizationId);
  const further = rule.emails.map((e) => e.toLowerCase());
  const pending = further.filter((e) => emailState(row, e, members) === 'pending');
  const allowed = further.filter((e) => !pending.includes(e));
  return { recipients: [...new Set([...users.map((u) => u.email.toLowerCase()), ...allowed])].sort(), pending };
}

/**
 * One delivery of one rule. The delivery row is the claim: its (ruleId, dayKey) is unique, so when two server
 * instances run the daily job at once only the one whose insert succeeds sends. Returns null when the claim is lost.
 */
async function deliver(
  ctx: AppContext,
  org: { id: string; name: string },
  rule: ReminderRuleRow,
  trigger: 'daily' | 'manual',
  dayKey: string,
  actorId: string | null,
  cache: DigestCache,
): Promise<ReminderDelivery | null> {
  const values = valuesOf(rule);
  let delivery: ReminderDeliveryRow;
  try {
    delivery = await ReminderDeliveryRow.create({
      id: randomUUID(),
      organizationId: org.id,
      ruleId: rule.id,
      ruleName: rule.name,
      trigger,
      dayKey,
      status: 'sending',
    });
  } catch (e) {
    if ((e as { name?: string }).name === 'SequelizeUniqueConstraintError') return null;
    throw e;
  }

  let status: ReminderDelivery['status'];
  let message: string;
  let recipients: string[] = [];
  let itemCount = 0;
  try {
    const digest = await buildDigest(ctx, org.id, org.name, values, utcDayKey(ctx.now()), cache);
    itemCount = digest.itemCount;
    const who = await recipientsOf(org.id, rule, values);
    recipients = who.recipients;
    const pendingNote = who.pending.length
      ? `; not mailed, awaiting an admin's approval: ${who.pending.join(', ')}`
      : '';
    if (itemCount === 0 && values.onlyWhenSomething) {
      status = 'skipped';
      message = 'Nothing to report: every chosen list is empty';
      recipients = [];
    } else if (!recipients.length) {
      status = 'skipped';
      message = who.pending.length
        ? `Nobody to tell: no active user has the chosen roles${pendingNote}`
        : 'Nobody to tell: no active user has the chosen roles and no address is set';
    } else {
      const failures: string[] = [];
      for (const to of recipients) {
        // One message per recipient: further addresses never see each other.
        const r = await ctx.mail.send({ organizationId: org.id, kind: 'reminder', to, actorId, ...digest.content });
        if (!r.ok) failures.push(`${to}: ${r.error ?? 'not sent'}`);
      }
      if (!failures.length) {
        status = 'sent';
        message = `Sent to ${recipients.length} ${recipients.length === 1 ? 'recipient' : 'recipients'}${pendingNote}`;
      } else {
        status = 'failed';
        message = `Sent to ${recipients.length - failures.length} of ${recipients.length}; not sent to ${failures.join('; ')}${pendingNote}`;
      }
    }
  } catch (e) {
    status = 'failed';
    message = `Could not build the reminder: ${e instanceof Error ? e.message : String(e)}`;
  }

  await ctx.db.sequelize.transaction(async (transaction) => {
    await delivery.update(
      { status, message: clip(message, 400), recipients: JSON.stringify(recipients), itemCount },
      { transaction },
    );
    await recordAudit(
      {
        organizationId: org.id,
        actorId,
        action: 'reminders.sent',
        entityType: 'reminder-rule',
        entityId: rule.id,
        summary: {
          ruleName: rule.name,
          trigger,
          dayKey,
          status,
          recipients: recipients.length,
          itemCount,
          message: clip(message, 400),
        },
      },
      transaction,
    );
  });
  return toDelivery(delivery);
}

/**
 * The daily job: for every organization whose reminder hour (UTC) has come today, each enabled rule without a daily
 * delivery today is sent once. Safe to call as often as wanted and from several server instances at once.
 */
export async function runDueReminders(ctx: AppContext): Promise<ReminderDelivery[]> {
  const now = ctx.now();
  const dayKey = utcDayKey(now);
  const out: ReminderDelivery[] = [];
  const orgs = await Organization.findAll({ attributes: ['id', 'name', 'settings'], order: [['id', 'ASC']] });
  for (const org of orgs) {
    if (now.getUTCHours() < parseSettings(org.settings).reminderHourUtc) continue;
    const rules = await ReminderRuleRow.findAll({
      where: { organizationId: org.id, enabled: true },
      order: [['name', 'ASC']],
    });
    if (!rules.length) continue;
    const done = new Set(
      (
        await ReminderDeliveryRow.findAll({ where: { ruleId: rules.map((r) => r.id), dayKey }, attributes: ['ruleId'] })
      ).map((d) => d.ruleId),
    );
    const cache: DigestCache = { lists: new Map() };
    for (const rule of rules) {
      if (done.has(rule.id)) continue;
      const d = await deliver(ctx, { id: org.id, name: org.name }, rule, 'daily', dayKey, null, cache);
      if (d) out.push(d);
    }
  }
  return out;
}

/** "Send now": one rule (even a disabled one), or every enabled rule of the organization, right away. */
export async function sendNow(ctx: AppContext, actor: AuthUser, ruleId?: string): Promise<ReminderDelivery[]> {
  const rules = ruleId
    ? [await findRule(actor, ruleId)]
    : await ReminderRuleRow.findAll({
        where: { organizationId: actor.organizationId, enabled: true },
        order: [['name', 'ASC']],
      });
  const org = await Organization.findByPk(actor.organizationId, { attributes: ['id', 'name'] });
  if (!org) throw ApiError.notFound('No such organization');
  const cache: DigestCache = { lists: new Map() };
  const out: ReminderDelivery[] = [];
  for (const rule of rules) {
    const d = await deliver(
      ctx,
      { id: org.id, name: org.name },
      rule,
      'manual',
      `manual:${randomUUID()}`,
      actor.id,
      cache,
    );
    if (d) out.push(d);
  }
  return out;
}

/** Runs `runDueReminders` now and then every `intervalMs` (default 5 minutes); never two runs at once. */
export function startReminderScheduler(
  ctx: AppContext,
  opts: { intervalMs?: number; firstRunAfterMs?: number } = {},
): { stop(): Promise<void> } {
  let running: Promise<void> | null = null;
  let stopped = false;
  const tick = (): void => {
    if (running || stopped) return;
    running = runDueReminders(ctx)
      .then((d) => {
        if (d.length)
          log.info({ deliveries: d.length }, `Reminders: ${d.map((x) => `${x.ruleName} ${x.status}`).join(', ')}`);
      })
      .catch((err: unknown) => log.error({ err }, 'reminder job failed'))
      .finally(() => {
        running = null;
      });
  };
  const first = setTimeout(tick, opts.firstRunAfterMs ?? 10_000);
  first.unref();
  const every = setInterval(tick, opts.intervalMs ?? 5 * 60_000);
  every.unref();
  return {
    async stop() {
      stopped = true;
      clearTimeout(first);
      clearInterval(every);
      if (running) await running;
    },
  };
}

// ---------------------------------------------------------------- outbox

/** Mail the local sink captured for the organization, newest first (with SMTP nothing is captured). */
export async function listOutbox(actor: AuthUser): Promise<OutboxMessage[]> {
  const rows = await CapturedMail.findAll({
    where: { organizationId: actor.organizationId },
    order: [['receivedAt', 'DESC']],
    limit: 200,
  });
  return rows.map((m) => ({
    id: m.id,
    receivedAt: m.receivedAt.toISOString(),
    from: m.from,
    to: parseArray<string>(m.to),
    subject: m.subject,
    text: m.text,
    kind: m.kind,
  }));
}
