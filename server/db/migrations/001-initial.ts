import { DataTypes, type QueryInterface } from 'sequelize';

/** Organizations, users, sites, audit events and revoked tokens. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('organizations', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    name: { type: DataTypes.STRING(200), allowNull: false },
    settings: { type: DataTypes.TEXT, allowNull: false, defaultValue: '{}' },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.createTable('users', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'CASCADE',
    },
    email: { type: DataTypes.STRING(320), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(20), allowNull: false },
    passwordHash: { type: DataTypes.STRING(255), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('users', ['organizationId']);
  await qi.createTable('sites', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'CASCADE',
    },
    name: { type: DataTypes.STRING(160), allowNull: false },
    address: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('sites', ['organizationId']);
  await qi.createTable('audit_events', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'CASCADE',
    },
    actorId: { type: DataTypes.STRING(36), allowNull: true },
    action: { type: DataTypes.STRING(80), allowNull: false },
    entityType: { type: DataTypes.STRING(40), allowNull: false },
    entityId: { type: DataTypes.STRING(64), allowNull: true },
    summary: { type: DataTypes.TEXT, allowNull: false, defaultValue: '{}' },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('audit_events', ['organizationId', 'createdAt']);
  await qi.createTable('revoked_tokens', {
    jti: { type: DataTypes.STRING(64), primaryKey: true },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('revoked_tokens');
  await qi.dropTable('audit_events');
  await qi.dropTable('sites');
  await qi.dropTable('users');
  await qi.dropTable('organizations');
}
