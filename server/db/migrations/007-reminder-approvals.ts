import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Reminder addresses outside the organization need an admin's approval before mail goes to them: the approved ones
 * of each rule (JSON array). Addresses already on a rule start unapproved, so an admin reviews them once.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('reminder_rules', 'approvedEmails', {
    type: DataTypes.TEXT,
    allowNull: false,
    defaultValue: '[]',
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeColumn('reminder_rules', 'approvedEmails');
}
