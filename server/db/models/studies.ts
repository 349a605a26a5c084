/** Sites, the device library, studies, their runs, and the equipment the studies label. */
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

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: string;
  declare organizationId: string;
  declare name: string;
  declare address: CreationOptional<string>;
  declare description: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
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
  /** Key of the generic starter-set entry this type is (server/engine/trip/genericLibrary.ts); null: the organization's own. */
  declare genericKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/**
 * A generic starter-set entry once offered to an organization: it is added to the library once, and never again
 * (an organization that removed it does not get it back).
 */
export class GenericLibraryOffer extends Model<
  InferAttributes<GenericLibraryOffer>,
  InferCreationAttributes<GenericLibraryOffer>
> {
  declare organizationId: string;
  declare genericKey: string;
  declare createdAt: CreationOptional<Date>;
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

export function initSite(sequelize: Sequelize): void {
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
}

export function initDeviceType(sequelize: Sequelize): void {
  DeviceType.init(
    {
      id: col.id(),
      organizationId: col.orgId(),
      name: { type: DataTypes.STRING(160), allowNull: false },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      source: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      definition: { type: DataTypes.TEXT, allowNull: false },
      genericKey: { type: DataTypes.STRING(60), allowNull: true },
      ...timestamps(),
    },
    { sequelize, tableName: 'device_types' },
  );
  GenericLibraryOffer.init(
    {
      organizationId: { type: DataTypes.STRING(36), allowNull: false, primaryKey: true },
      genericKey: { type: DataTypes.STRING(60), allowNull: false, primaryKey: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'generic_library_offers', updatedAt: false },
  );
}

export function initStudy(sequelize: Sequelize): void {
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
    // Which run a study's results stand on is cached for the results routes (server/db/readCache.ts).
    { sequelize, tableName: 'studies', hooks: bumpOnWrite('studies') },
  );
}

export function initStudyRun(sequelize: Sequelize): void {
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
    { sequelize, tableName: 'study_runs', timestamps: false, hooks: bumpOnWrite('studies') },
  );
}

export function initEquipment(sequelize: Sequelize): void {
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
}
