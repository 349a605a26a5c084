import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Field-report triage, one-time links (invitations and password resets), reminder rules and their deliveries,
 * mail captured by the local SMTP sink.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const org = {
    type: DataTypes.STRING(36),
    allowNull: false,
    references: { model: 'organizations', key: 'id' },
    onDelete: 'CASCADE',
  };
  const ts = () => ({
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });

  await qi.addColumn('field_reports', 'acknowledgedAt', { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn('field_reports', 'acknowledgedById', { type: DataTypes.STRING(36), allowNull: true });
  await qi.addColumn('field_reports', 'resolvedAt', { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn('field_reports', 'resolvedById', { type: DataTypes.STRING(36), allowNull: true });

  await qi.createTable('link_tokens', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    purpose: { type: DataTypes.STRING(20), allowNull: false },
    tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    email: { type: DataTypes.STRING(320), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.STRING(20), allowNull: true },
    userId: { type: DataTypes.STRING(36), allowNull: true },
    createdById: { type: DataTypes.STRING(36), allowNull: true },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    revokedAt: { type: DataTypes.DATE, allowNull: true },
    ...ts(),
  });
  await qi.addIndex('link_tokens', ['organizationId', 'purpose']);

  await qi.createTable('reminder_rules', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    name: { type: DataTypes.STRING(120), allowNull: false },
    enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    lists: { type: DataTypes.TEXT, allowNull: false },
    roles: { type: DataTypes.TEXT, allowNull: false },
    emails: { type: DataTypes.TEXT, allowNull: false },
    onlyWhenSomething: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...ts(),
  });

  await qi.createTable('reminder_deliveries', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    ruleId: { type: DataTypes.STRING(36), allowNull: false },
    ruleName: { type: DataTypes.STRING(120), allowNull: false },
    trigger: { type: DataTypes.STRING(10), allowNull: false },
    /** YYYY-MM-DD for the daily job (one per rule and day, across server instances); "manual:<id>" for send-now. */
    dayKey: { type: DataTypes.STRING(60), allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false },
    recipients: { type: DataTypes.TEXT, allowNull: false, defaultValue: '[]' },
    itemCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    ...ts(),
  });
  await qi.addIndex('reminder_deliveries', ['ruleId', 'dayKey'], { unique: true });
  await qi.addIndex('reminder_deliveries', ['organizationId', 'createdAt']);

  await qi.createTable('captured_mail', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: { type: DataTypes.STRING(36), allowNull: true },
    messageId: { type: DataTypes.STRING(300), allowNull: true },
    kind: { type: DataTypes.STRING(40), allowNull: false, defaultValue: '' },
    from: { type: DataTypes.STRING(320), allowNull: false, defaultValue: '' },
    to: { type: DataTypes.TEXT, allowNull: false, defaultValue: '[]' },
    subject: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    text: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    receivedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('captured_mail', ['organizationId', 'receivedAt']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('captured_mail');
  await qi.dropTable('reminder_deliveries');
  await qi.dropTable('reminder_rules');
  await qi.dropTable('link_tokens');
  for (const c of ['resolvedById', 'resolvedAt', 'acknowledgedById', 'acknowledgedAt'])
    await qi.removeColumn('field_reports', c);
}
