import { QueryTypes, type QueryInterface } from 'sequelize';

/**
 * Label settings of every organization: the unit order on labels (SI first, as labels printed until now), and a
 * description of the clothing and equipment of each stored PPE level that has none — the default description
 * where the level is one of the default levels (same name and limit), otherwise left for the admin to write.
 */
const DEFAULT_DESCRIPTIONS: Record<string, { max: number; description: string }> = {
  'PPE level 1': { max: 4, description: 'Arc-rated clothing and face protection, at least 4 cal/cm²' },
  'PPE level 2': { max: 8, description: 'Arc-rated clothing and hood or face shield, at least 8 cal/cm²' },
  'PPE level 3': { max: 25, description: 'Arc flash suit, at least 25 cal/cm²' },
  'PPE level 4': { max: 40, description: 'Arc flash suit, at least 40 cal/cm²' },
};

type Row = { id: string; settings: string | null };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const rows = await qi.sequelize.query<Row>('SELECT id, settings FROM organizations', { type: QueryTypes.SELECT });
  for (const row of rows) {
    let settings: Record<string, unknown>;
    try {
      settings = JSON.parse(row.settings || '{}') as Record<string, unknown>;
    } catch {
      continue; // unreadable settings fall back to the defaults at read time
    }
    if (typeof settings !== 'object' || settings === null) continue;
    let changed = false;
    if (settings.labelUnitOrder === undefined) {
      settings.labelUnitOrder = 'si-first';
      changed = true;
    }
    if (Array.isArray(settings.ppeLevels)) {
      for (const level of settings.ppeLevels as { name?: string; maxCalPerCm2?: number; description?: string }[]) {
        const d = level?.name ? DEFAULT_DESCRIPTIONS[level.name] : undefined;
        if (d && !level.description && level.maxCalPerCm2 === d.max) {
          level.description = d.description;
          changed = true;
        }
      }
    }
    if (changed)
      await qi.sequelize.query('UPDATE organizations SET settings = :settings WHERE id = :id', {
        replacements: { settings: JSON.stringify(settings), id: row.id },
      });
  }
}

export async function down(): Promise<void> {
  // The added settings are harmless to older code (unknown keys are ignored); nothing to undo.
}
