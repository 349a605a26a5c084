import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * `users.units`: the unit system a user reads lengths in on screen ('us': in and ft, 'si': mm and m); null until the
 * user chooses (the organization's label unit order applies). Stored values are SI whatever the choice.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('users', 'units', { type: DataTypes.STRING(2), allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeColumn('users', 'units');
}
