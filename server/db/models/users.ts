/** Organizations, users, invitation and reset links, revoked sign-in tokens. */
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Role } from '../../../shared/schemas/common';
import type { UnitSystem } from '../../../shared/schemas/auth';
import { forgetUser } from '../../auth/cache';
import { col, timestamps } from './columns';
import { bumpOnWrite } from '../readCache';

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
  /** The unit system lengths are shown in ('us' or 'si'); null: the organization's label unit order. */
  declare units: CreationOptional<UnitSystem | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class RevokedToken extends Model<InferAttributes<RevokedToken>, InferCreationAttributes<RevokedToken>> {
  declare jti: string;
  declare expiresAt: Date;
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

export function initOrganization(sequelize: Sequelize): void {
  Organization.init(
    {
      id: col.id(),
      name: { type: DataTypes.STRING(200), allowNull: false },
      settings: { type: DataTypes.TEXT, defaultValue: '{}' },
      ...timestamps(),
    },
    // The organization's settings are read through a short-lived cache (server/db/readCache.ts).
    { sequelize, tableName: 'organizations', hooks: bumpOnWrite('organizations') },
  );
}

export function initUser(sequelize: Sequelize): void {
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
      units: { type: DataTypes.STRING(2), allowNull: true },
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
}

export function initLinkToken(sequelize: Sequelize): void {
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
}

export function initRevokedToken(sequelize: Sequelize): void {
  RevokedToken.init(
    { jti: { type: DataTypes.STRING(64), primaryKey: true }, expiresAt: { type: DataTypes.DATE, allowNull: false } },
    { sequelize, tableName: 'revoked_tokens', timestamps: false },
  );
}
