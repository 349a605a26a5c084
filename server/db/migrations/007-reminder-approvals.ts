import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Reminder addresses outside the organization need an admin's approval before mail goes to them: the approved ones
 * of each rule (JSON array). Addresses already on a rule were set up before approval existed and were being mailed:
 * they stay approved, so no reminder stops silently at the upgrade (new outside addresses wait for an admin).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('reminder_rules', 'approvedEmails', {
    type: DataTypes.TEXT,
    allowNull: false,
    defaultValue: '[]',
  });
  await qi.sequelize.query('UPDATE reminder_rules SET "approvedEmails" = emails');
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeColumn('reminder_rules', 'approvedEmails');
}
