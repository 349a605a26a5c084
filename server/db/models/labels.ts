/** Labels, field reports on them, and print batches. */
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { col, timestamps } from './columns';
import { bumpOnWrite } from '../readCache';

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

export function initLabel(sequelize: Sequelize): void {
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
    // The public label check reads labels through a short-lived cache (server/db/readCache.ts).
    { sequelize, tableName: 'labels', timestamps: false, hooks: bumpOnWrite('labels') },
  );
}

export function initFieldReport(sequelize: Sequelize): void {
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
}

export function initLabelBatch(sequelize: Sequelize): void {
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
}
