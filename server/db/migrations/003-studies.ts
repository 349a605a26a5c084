import { DataTypes, type QueryInterface } from 'sequelize';

/** Studies (revisions of a site's model), their runs, and the site's equipment that carries labels. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const org = {
    type: DataTypes.STRING(36),
    allowNull: false,
    references: { model: 'organizations', key: 'id' },
    onDelete: 'CASCADE',
  };
  const site = {
    type: DataTypes.STRING(36),
    allowNull: false,
    references: { model: 'sites', key: 'id' },
    onDelete: 'CASCADE',
  };
  await qi.createTable('studies', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    siteId: site,
    revision: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.STRING(200), allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    model: { type: DataTypes.TEXT, allowNull: false },
    modelVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    modelUpdatedAt: { type: DataTypes.DATE, allowNull: false },
    lastEditedById: { type: DataTypes.STRING(36), allowNull: true },
    parentStudyId: { type: DataTypes.STRING(36), allowNull: true },
    submittedAt: { type: DataTypes.DATE, allowNull: true },
    submittedById: { type: DataTypes.STRING(36), allowNull: true },
    approvedAt: { type: DataTypes.DATE, allowNull: true },
    approvedById: { type: DataTypes.STRING(36), allowNull: true },
    approverName: { type: DataTypes.STRING(120), allowNull: true },
    licenceNumber: { type: DataTypes.STRING(60), allowNull: true },
    jurisdiction: { type: DataTypes.STRING(120), allowNull: true },
    approvedRunId: { type: DataTypes.STRING(36), allowNull: true },
    supersededAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('studies', ['siteId', 'revision'], { unique: true });
  await qi.addIndex('studies', ['organizationId', 'status']);
  await qi.createTable('study_runs', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    studyId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'studies', key: 'id' },
      onDelete: 'CASCADE',
    },
    modelVersion: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
    message: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    modelSnapshot: { type: DataTypes.TEXT, allowNull: false },
    settingsSnapshot: { type: DataTypes.TEXT, allowNull: false },
    results: { type: DataTypes.TEXT, allowNull: true },
    startedById: { type: DataTypes.STRING(36), allowNull: true },
    startedAt: { type: DataTypes.DATE, allowNull: false },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
  });
  await qi.addIndex('study_runs', ['studyId', 'startedAt']);
  await qi.createTable('equipment', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: org,
    siteId: site,
    tag: { type: DataTypes.STRING(64), allowNull: false },
    name: { type: DataTypes.STRING(160), allowNull: false },
    equipmentClass: { type: DataTypes.STRING(60), allowNull: false },
    nominalKv: { type: DataTypes.FLOAT, allowNull: false },
    lastStudyId: { type: DataTypes.STRING(36), allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('equipment', ['siteId', 'tag'], { unique: true });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('equipment');
  await qi.dropTable('study_runs');
  await qi.dropTable('studies');
}
