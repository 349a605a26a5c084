/** The audit log, reminder rules and their deliveries, and captured mail. */
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { col, timestamps } from './columns';

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

export function initAuditEvent(sequelize: Sequelize): void {
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
}

export function initReminderRuleRow(sequelize: Sequelize): void {
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
}

export function initReminderDeliveryRow(sequelize: Sequelize): void {
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
}

export function initCapturedMail(sequelize: Sequelize): void {
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
}
