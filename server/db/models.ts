import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Role } from '../../shared/schemas/common';

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

export function initModels(sequelize: Sequelize): void {
  const id = { type: DataTypes.STRING(36), primaryKey: true };
  const orgId = { type: DataTypes.STRING(36), allowNull: false };
  const timestamps = {
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  };
  Organization.init(
    { id, name: { type: DataTypes.STRING(200), allowNull: false }, settings: { type: DataTypes.TEXT, defaultValue: '{}' }, ...timestamps },
    { sequelize, tableName: 'organizations' },
  );
  User.init(
    {
      id,
      organizationId: orgId,
      email: { type: DataTypes.STRING(320), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.STRING(20), allowNull: false },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      ...timestamps,
    },
    { sequelize, tableName: 'users' },
  );
  Site.init(
    {
      id,
      organizationId: orgId,
      name: { type: DataTypes.STRING(160), allowNull: false },
      address: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      ...timestamps,
    },
    { sequelize, tableName: 'sites' },
  );
  AuditEvent.init(
    {
      id,
      organizationId: orgId,
      actorId: { type: DataTypes.STRING(36), allowNull: true },
      action: { type: DataTypes.STRING(80), allowNull: false },
      entityType: { type: DataTypes.STRING(40), allowNull: false },
      entityId: { type: DataTypes.STRING(64), allowNull: true },
      summary: { type: DataTypes.TEXT, allowNull: false, defaultValue: '{}' },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'audit_events', updatedAt: false },
  );
  DeviceType.init(
    {
      id,
      organizationId: orgId,
      name: { type: DataTypes.STRING(160), allowNull: false },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      source: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      definition: { type: DataTypes.TEXT, allowNull: false },
      ...timestamps,
    },
    { sequelize, tableName: 'device_types' },
  );
  RevokedToken.init(
    { jti: { type: DataTypes.STRING(64), primaryKey: true }, expiresAt: { type: DataTypes.DATE, allowNull: false } },
    { sequelize, tableName: 'revoked_tokens', timestamps: false },
  );
}
