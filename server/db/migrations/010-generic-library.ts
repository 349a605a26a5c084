import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';

/**
 * The generic starter set of the device library (server/engine/trip/genericLibrary.ts):
 * - `device_types.genericKey`: the starter-set entry a type is (null: the organization's own);
 * - `generic_library_offers`: the entries each organization has been given, so an entry is added once and an
 *   organization that removed one does not get it back.
 * Every organization existing now was given the six earlier generic types when it was created: they are recorded as
 * offered, and the ones still stored under their name and never edited since are marked as those entries (the rest
 * of the starter set is added at the next start, `addMissingGenericTypes`).
 */

/** The six earlier generic types by name, with the key of the entry each one became (frozen with this migration). */
const EARLIER: Record<string, string> = {
  'Generic 20 A molded-case breaker': 'tm-20',
  'Generic 200 A current-limiting fuse': 'fuse-lv-200',
  'Feeder relay, very inverse': 'relay-ieee-vi',
  'Incomer relay, standard inverse': 'relay-iec-si',
  'Digitized band, multiples of rating': 'band-example',
  'Generic LSIG trip unit, 1600 A frame': 'etu-1600',
};

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('device_types', 'genericKey', { type: DataTypes.STRING(60), allowNull: true });
  await qi.createTable('generic_library_offers', {
    organizationId: {
      type: DataTypes.STRING(36),
      allowNull: false,
      primaryKey: true,
      references: { model: 'organizations', key: 'id' },
      onDelete: 'CASCADE',
    },
    genericKey: { type: DataTypes.STRING(60), allowNull: false, primaryKey: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await markEarlierGenericTypes(qi);
}

/** Records the earlier six as offered to every organization and marks the unedited ones (idempotent). */
export async function markEarlierGenericTypes(qi: QueryInterface): Promise<void> {
  const orgs = await qi.sequelize.query<{ id: string }>('SELECT id FROM organizations', { type: QueryTypes.SELECT });
  const now = new Date();
  for (const org of orgs) {
    const offered = await qi.sequelize.query<{ genericKey: string }>(
      'SELECT "genericKey" FROM generic_library_offers WHERE "organizationId" = :org',
      { type: QueryTypes.SELECT, replacements: { org: org.id } },
    );
    const have = new Set(offered.map((o) => o.genericKey));
    const missing = Object.values(EARLIER).filter((key) => !have.has(key));
    if (missing.length > 0) {
      await qi.bulkInsert(
        'generic_library_offers',
        missing.map((genericKey) => ({ organizationId: org.id, genericKey, createdAt: now })),
      );
    }
    for (const [name, key] of Object.entries(EARLIER)) {
      if (!missing.includes(key)) continue;
      const rows = await qi.sequelize.query<{ id: string }>(
        `SELECT id FROM device_types WHERE "organizationId" = :org AND name = :name AND "genericKey" IS NULL
           AND "createdAt" = "updatedAt" ORDER BY "createdAt", id`,
        { type: QueryTypes.SELECT, replacements: { org: org.id, name } },
      );
      if (rows.length > 0) {
        await qi.sequelize.query('UPDATE device_types SET "genericKey" = :key WHERE id = :id', {
          replacements: { key, id: rows[0].id },
        });
      }
    }
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('generic_library_offers');
  await qi.removeColumn('device_types', 'genericKey');
}
