import { DataTypes, type QueryInterface } from 'sequelize';

/** The organization's device library. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('device_types', {
    id: { type: DataTypes.STRING(36), primaryKey: true },
    organizationId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'CASCADE',
    },
    name: { type: DataTypes.STRING(160), allowNull: false },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    source: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    definition: { type: DataTypes.TEXT, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('device_types', ['organizationId', 'name']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('device_types');
}
