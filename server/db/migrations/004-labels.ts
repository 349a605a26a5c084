import { DataTypes, type QueryInterface } from 'sequelize';

/** Labels issued on approval, print batches, and field reports from electricians. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const org = {
    type: DataTypes.STRING(36),
    allowNull: false,
    references: { model: 'organizations', key: 'id' },
    onDelete: 'CASCADE',
  };
  await qi.createTable('labels', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    siteId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'sites', key: 'id' },
      onDelete: 'CASCADE',
    },
    studyId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'studies', key: 'id' },
      onDelete: 'CASCADE',
    },
    equipmentTag: { type: DataTypes.STRING(64), allowNull: false },
    code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    content: { type: DataTypes.TEXT, allowNull: false },
    reviewBy: { type: DataTypes.DATE, allowNull: false },
    issuedAt: { type: DataTypes.DATE, allowNull: false },
    printedAt: { type: DataTypes.DATE, allowNull: true },
    installedAt: { type: DataTypes.DATE, allowNull: true },
    installedById: { type: DataTypes.STRING(36), allowNull: true },
    installPhotoKey: { type: DataTypes.STRING(200), allowNull: true },
    supersededAt: { type: DataTypes.DATE, allowNull: true },
  });
  await qi.addIndex('labels', ['siteId', 'equipmentTag']);
  await qi.addIndex('labels', ['studyId']);
  await qi.createTable('field_reports', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    siteId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'sites', key: 'id' },
      onDelete: 'CASCADE',
    },
    labelId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'labels', key: 'id' },
      onDelete: 'CASCADE',
    },
    reporterId: { type: DataTypes.STRING(36), allowNull: false },
    kind: { type: DataTypes.STRING(30), allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    photoKey: { type: DataTypes.STRING(200), allowNull: true },
    status: { type: DataTypes.STRING(20), allowNull: false },
    resolutionNote: { type: DataTypes.TEXT, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('field_reports', ['organizationId', 'status']);
  await qi.createTable('label_batches', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    requestedById: { type: DataTypes.STRING(36), allowNull: false },
    labelIds: { type: DataTypes.TEXT, allowNull: false },
    size: { type: DataTypes.STRING(10), allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
    message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    fileKey: { type: DataTypes.STRING(200), allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('label_batches');
  await qi.dropTable('field_reports');
  await qi.dropTable('labels');
}
