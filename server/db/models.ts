import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Role } from '../../shared/schemas/common';
import { forgetUser } from '../auth/cache';

export class Organization extends Model<InferAttributes<Organization>, InferCreationAttributes<Organization>> {
  declare id: string;
  declare name: string;
  /** JSON text: organization settings (review interval, signal-word rule, PPE levels, …). */
  declare settings: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: string;
  declare organizationId: string;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare passwordHash: string;
  declare active: CreationOptional<boolean>;
  /** Bumped on password change and deactivation: older tokens stop working. */
  declare tokenVersion: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: string;
  declare organizationId: string;
  declare name: string;
  declare address: CreationOptional<string>;
  declare description: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: string;
  declare organizationId: string;
  declare actorId: string | null;
  declare action: string;
  declare entityType: string;
  declare entityId: string | null;
  declare summary: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
}

function appendOnly(): never {
  throw new Error('Audit events are append-only: they cannot be changed or deleted');
}

export class RevokedToken extends Model<InferAttributes<RevokedToken>, InferCreationAttributes<RevokedToken>> {
  declare jti: string;
  declare expiresAt: Date;
}

export class DeviceType extends Model<InferAttributes<DeviceType>, InferCreationAttributes<DeviceType>> {
  declare id: string;
  declare organizationId: string;
  declare name: string;
  declare kind: string;
  declare description: CreationOptional<string>;
  declare source: CreationOptional<string>;
  /** JSON text of the DeviceDefinition (shared/schemas/deviceLibrary.ts). */
  declare definition: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export type StudyStatus = 'draft' | 'in-review' | 'approved' | 'superseded';

export class Study extends Model<InferAttributes<Study>, InferCreationAttributes<Study>> {
  declare id: string;
  declare organizationId: string;
  declare siteId: string;
  declare revision: number;
  declare title: string;
  declare status: StudyStatus;
  /** JSON text of the system model (may be incomplete while a draft is edited). */
  declare model: string;
  /** Bumped on every model change: the optimistic-concurrency check of PUT /model. */
  declare modelVersion: CreationOptional<number>;
  declare modelUpdatedAt: Date;
  declare lastEditedById: string | null;
  declare parentStudyId: CreationOptional<string | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare submittedById: CreationOptional<string | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare approvedById: CreationOptional<string | null>;
  declare approverName: CreationOptional<string | null>;
  declare licenceNumber: CreationOptional<string | null>;
  declare jurisdiction: CreationOptional<string | null>;
  declare approvedRunId: CreationOptional<string | null>;
  declare supersededAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export type RunStatus = 'queued' | 'running' | 'done' | 'failed';

export class StudyRun extends Model<InferAttributes<StudyRun>, InferCreationAttributes<StudyRun>> {
  declare id: string;
  declare organizationId: string;
  declare studyId: string;
  declare modelVersion: number;
  declare status: RunStatus;
  declare progress: CreationOptional<number>;
  declare message: CreationOptional<string>;
  declare modelSnapshot: string;
  declare settingsSnapshot: string;
  declare results: CreationOptional<string | null>;
  declare startedById: string | null;
  declare startedAt: Date;
  declare finishedAt: CreationOptional<Date | null>;
}

export class Equipment extends Model<InferAttributes<Equipment>, InferCreationAttributes<Equipment>> {
  declare id: string;
  declare organizationId: string;
  declare siteId: string;
  /** The bus id in the site's model: the equipment's tag. */
  declare tag: string;
  declare name: string;
  declare equipmentClass: string;
  declare nominalKv: number;
  declare lastStudyId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Label extends Model<InferAttributes<Label>, InferCreationAttributes<Label>> {
  declare id: string;
  declare organizationId: string;
  declare siteId: string;
  declare studyId: string;
  declare equipmentTag: string;
  /** Unguessable public code (80 random bits) printed in the QR code. */
  declare code: string;
  /** JSON text of the LabelContent snapshot: what the printed label says. */
  declare content: string;
  declare reviewBy: Date;
  declare issuedAt: Date;
  declare printedAt: CreationOptional<Date | null>;
  declare installedAt: CreationOptional<Date | null>;
  declare installedById: CreationOptional<string | null>;
  declare installPhotoKey: CreationOptional<string | null>;
  declare supersededAt: CreationOptional<Date | null>;
}

export type FieldReportStatus = 'open' | 'acknowledged' | 'resolved';

export class FieldReport extends Model<InferAttributes<FieldReport>, InferCreationAttributes<FieldReport>> {
  declare id: string;
  declare organizationId: string;
  declare siteId: string;
  declare labelId: string;
  declare reporterId: string;
  declare kind: string;
  declare text: string;
  declare photoKey: string | null;
  declare status: FieldReportStatus;
  declare resolutionNote: CreationOptional<string | null>;
  declare acknowledgedAt: CreationOptional<Date | null>;
  declare acknowledgedById: CreationOptional<string | null>;
  declare resolvedAt: CreationOptional<Date | null>;
  declare resolvedById: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export type LinkPurpose = 'invitation' | 'password-reset';

/** A one-time link (invitation or password reset): only the SHA-256 of the token is stored. */
export class LinkToken extends Model<InferAttributes<LinkToken>, InferCreationAttributes<LinkToken>> {
  declare id: string;
  declare organizationId: string;
  declare purpose: LinkPurpose;
  declare tokenHash: string;
  declare email: string;
  declare name: string;
  declare role: string | null;
  declare userId: string | null;
  declare createdById: string | null;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ReminderRuleRow extends Model<InferAttributes<ReminderRuleRow>, InferCreationAttributes<ReminderRuleRow>> {
  declare id: string;
  declare organizationId: string;
  declare name: string;
  declare enabled: boolean;
  /** JSON arrays. */
  declare lists: string;
  declare roles: string;
  declare emails: string;
  /** JSON array: the addresses of `emails` outside the organization that an admin approved. */
  declare approvedEmails: CreationOptional<string>;
  declare onlyWhenSomething: boolean;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ReminderDeliveryRow extends Model<
  InferAttributes<ReminderDeliveryRow>,
  InferCreationAttributes<ReminderDeliveryRow>
> {
  declare id: string;
  declare organizationId: string;
  declare ruleId: string;
  declare ruleName: string;
  declare trigger: 'daily' | 'manual';
  declare dayKey: string;
  declare status: 'sending' | 'sent' | 'skipped' | 'failed';
  declare recipients: CreationOptional<string>;
  declare itemCount: CreationOptional<number>;
  declare message: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A message received by the local SMTP sink (development and tests). */
export class CapturedMail extends Model<InferAttributes<CapturedMail>, InferCreationAttributes<CapturedMail>> {
  declare id: string;
  declare organizationId: string | null;
  declare messageId: string | null;
  declare kind: CreationOptional<string>;
  declare from: CreationOptional<string>;
  declare to: CreationOptional<string>;
  declare subject: CreationOptional<string>;
  declare text: CreationOptional<string>;
  declare receivedAt: Date;
}

export class LabelBatch extends Model<InferAttributes<LabelBatch>, InferCreationAttributes<LabelBatch>> {
  declare id: string;
  declare organizationId: string;
  declare requestedById: string;
  declare labelIds: string;
  declare size: string;
  declare status: 'queued' | 'running' | 'done' | 'failed';
  declare progress: CreationOptional<number>;
  declare message: CreationOptional<string>;
  declare fileKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initModels(sequelize: Sequelize): void {
  // Sequelize writes into attribute definitions (e.g. their column name), so every attribute gets its own object.
  const col = {
    id: () => ({ type: DataTypes.STRING(36), primaryKey: true }),
    orgId: () => ({ type: DataTypes.STRING(36), allowNull: false }),
    nullableDate: () => ({ type: DataTypes.DATE, allowNull: true }),
    nullableId: () => ({ type: DataTypes.STRING(36), allowNull: true }),
  };
  const timestamps = () => ({
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  Organization.init(
    {
      id: col.id(),
      name: { type: DataTypes.STRING(200), allowNull: false },
      settings: { type: DataTypes.TEXT, defaultValue: '{}' },
      ...timestamps(),
    },
    { sequelize, tableName: 'organizations' },
  );
  User.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      email: { type: DataTypes.STRING(320), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.STRING(20), allowNull: false },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      ...timestamps(),
    },
    {
      sequelize,
      tableName: 'users',
      // Signed-in requests read users through a short-lived cache (server/auth/cache.ts): any change drops the entry,
      // when saved and again when its transaction commits (a request in between may have read the old row).
      hooks: {
        afterSave: (u, options) => {
          forgetUser(u.id);
          options.transaction?.afterCommit(() => forgetUser(u.id));
        },
        afterDestroy: (u, options) => {
          forgetUser(u.id);
          options.transaction?.afterCommit(() => forgetUser(u.id));
        },
        afterBulkUpdate: (options) => {
          forgetUser();
          options.transaction?.afterCommit(() => forgetUser());
        },
        afterBulkDestroy: (options) => {
          forgetUser();
          options.transaction?.afterCommit(() => forgetUser());
        },
      },
    },
  );
  Site.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      address: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      ...timestamps(),
    },
    { sequelize, tableName: 'sites' },
  );
  AuditEvent.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      actorId: { type: DataTypes.STRING(36), allowNull: true },
      action: { type: DataTypes.STRING(80), allowNull: false },
      entityType: { type: DataTypes.STRING(40), allowNull: false },
      entityId: { type: DataTypes.STRING(64), allowNull: true },
      summary: { type: DataTypes.TEXT, allowNull: false, defaultValue: '{}' },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    {
      sequelize,
      tableName: 'audit_events',
      updatedAt: false,
      // Append-only: the application never changes or removes an event once written.
      hooks: {
        beforeUpdate: appendOnly,
        beforeBulkUpdate: appendOnly,
        beforeDestroy: appendOnly,
        beforeBulkDestroy: appendOnly,
        beforeUpsert: appendOnly,
      },
    },
  );
  DeviceType.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      source: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      definition: { type: DataTypes.TEXT, allowNull: false },
      ...timestamps(),
    },
    { sequelize, tableName: 'device_types' },
  );
  Study.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      siteId: { type: DataTypes.STRING(36), allowNull: false },
      revision: { type: DataTypes.INTEGER, allowNull: false },
      title: { type: DataTypes.STRING(200), allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false },
      model: { type: DataTypes.TEXT, allowNull: false },
      modelVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      modelUpdatedAt: { type: DataTypes.DATE, allowNull: false },
      lastEditedById: col.nullableId(),
      parentStudyId: col.nullableId(),
      submittedAt: col.nullableDate(),
      submittedById: col.nullableId(),
      approvedAt: col.nullableDate(),
      approvedById: col.nullableId(),
      approverName: { type: DataTypes.STRING(120), allowNull: true },
      licenceNumber: { type: DataTypes.STRING(60), allowNull: true },
      jurisdiction: { type: DataTypes.STRING(120), allowNull: true },
      approvedRunId: col.nullableId(),
      supersededAt: col.nullableDate(),
      ...timestamps(),
    },
    { sequelize, tableName: 'studies' },
  );
  StudyRun.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      studyId: { type: DataTypes.STRING(36), allowNull: false },
      modelVersion: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false },
      progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
      message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      modelSnapshot: { type: DataTypes.TEXT, allowNull: false },
      settingsSnapshot: { type: DataTypes.TEXT, allowNull: false },
      results: { type: DataTypes.TEXT, allowNull: true },
      startedById: col.nullableId(),
      startedAt: { type: DataTypes.DATE, allowNull: false },
      finishedAt: col.nullableDate(),
    },
    { sequelize, tableName: 'study_runs', timestamps: false },
  );
  Equipment.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      siteId: { type: DataTypes.STRING(36), allowNull: false },
      tag: { type: DataTypes.STRING(64), allowNull: false },
      name: { type: DataTypes.STRING(160), allowNull: false },
      equipmentClass: { type: DataTypes.STRING(60), allowNull: false },
      nominalKv: { type: DataTypes.FLOAT, allowNull: false },
      lastStudyId: col.nullableId(),
      ...timestamps(),
    },
    { sequelize, tableName: 'equipment' },
  );
  Label.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      siteId: { type: DataTypes.STRING(36), allowNull: false },
      studyId: { type: DataTypes.STRING(36), allowNull: false },
      equipmentTag: { type: DataTypes.STRING(64), allowNull: false },
      code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
      content: { type: DataTypes.TEXT, allowNull: false },
      reviewBy: { type: DataTypes.DATE, allowNull: false },
      issuedAt: { type: DataTypes.DATE, allowNull: false },
      printedAt: col.nullableDate(),
      installedAt: col.nullableDate(),
      installedById: col.nullableId(),
      installPhotoKey: { type: DataTypes.STRING(200), allowNull: true },
      supersededAt: col.nullableDate(),
    },
    { sequelize, tableName: 'labels', timestamps: false },
  );
  FieldReport.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      siteId: { type: DataTypes.STRING(36), allowNull: false },
      labelId: { type: DataTypes.STRING(36), allowNull: false },
      reporterId: { type: DataTypes.STRING(36), allowNull: false },
      kind: { type: DataTypes.STRING(30), allowNull: false },
      text: { type: DataTypes.TEXT, allowNull: false },
      photoKey: { type: DataTypes.STRING(200), allowNull: true },
      status: { type: DataTypes.STRING(20), allowNull: false },
      resolutionNote: { type: DataTypes.TEXT, allowNull: true },
      acknowledgedAt: col.nullableDate(),
      acknowledgedById: col.nullableId(),
      resolvedAt: col.nullableDate(),
      resolvedById: col.nullableId(),
      ...timestamps(),
    },
    { sequelize, tableName: 'field_reports' },
  );
  LinkToken.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      purpose: { type: DataTypes.STRING(20), allowNull: false },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
      email: { type: DataTypes.STRING(320), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.STRING(20), allowNull: true },
      userId: col.nullableId(),
      createdById: col.nullableId(),
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: col.nullableDate(),
      revokedAt: col.nullableDate(),
      ...timestamps(),
    },
    { sequelize, tableName: 'link_tokens' },
  );
  ReminderRuleRow.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      name: { type: DataTypes.STRING(120), allowNull: false },
      enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      lists: { type: DataTypes.TEXT, allowNull: false },
      roles: { type: DataTypes.TEXT, allowNull: false },
      emails: { type: DataTypes.TEXT, allowNull: false },
      approvedEmails: { type: DataTypes.TEXT, allowNull: false, defaultValue: '[]' },
      onlyWhenSomething: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      ...timestamps(),
    },
    { sequelize, tableName: 'reminder_rules' },
  );
  ReminderDeliveryRow.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      ruleId: { type: DataTypes.STRING(36), allowNull: false },
      ruleName: { type: DataTypes.STRING(120), allowNull: false },
      trigger: { type: DataTypes.STRING(10), allowNull: false },
      dayKey: { type: DataTypes.STRING(60), allowNull: false },
      status: { type: DataTypes.STRING(10), allowNull: false },
      recipients: { type: DataTypes.TEXT, allowNull: false, defaultValue: '[]' },
      itemCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      ...timestamps(),
    },
    { sequelize, tableName: 'reminder_deliveries' },
  );
  CapturedMail.init(
    {
      id: col.id(),
      organizationId: col.nullableId(),
      messageId: { type: DataTypes.STRING(300), allowNull: true },
      kind: { type: DataTypes.STRING(40), allowNull: false, defaultValue: '' },
      from: { type: DataTypes.STRING(320), allowNull: false, defaultValue: '' },
      to: { type: DataTypes.TEXT, allowNull: false, defaultValue: '[]' },
      subject: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      text: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      receivedAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'captured_mail', timestamps: false },
  );
  LabelBatch.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      requestedById: { type: DataTypes.STRING(36), allowNull: false },
      labelIds: { type: DataTypes.TEXT, allowNull: false },
      size: { type: DataTypes.STRING(10), allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false },
      progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
      message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      fileKey: { type: DataTypes.STRING(200), allowNull: true },
      ...timestamps(),
    },
    { sequelize, tableName: 'label_batches' },
  );
  RevokedToken.init(
    { jti: { type: DataTypes.STRING(64), primaryKey: true }, expiresAt: { type: DataTypes.DATE, allowNull: false } },
    { sequelize, tableName: 'revoked_tokens', timestamps: false },
  );
}
