import type { QueryInterface } from 'sequelize';

/**
 * The audit log is append-only in the database itself, not only in the application's models: triggers refuse every
 * UPDATE and DELETE of an audit event (and, on PostgreSQL, TRUNCATE), whoever runs it.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const sequelize = qi.sequelize;
  if (sequelize.getDialect() === 'postgres') {
    await sequelize.query(`
      CREATE OR REPLACE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'audit_events is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
      END
      $$`);
    await sequelize.query(`CREATE TRIGGER audit_events_no_change BEFORE UPDATE OR DELETE ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_append_only()`);
    await sequelize.query(`CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
      FOR EACH STATEMENT EXECUTE FUNCTION audit_events_append_only()`);
  } else {
    await sequelize.query(`CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events
      BEGIN SELECT RAISE(ABORT, 'audit_events is append-only: UPDATE refused'); END`);
    await sequelize.query(`CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events
      BEGIN SELECT RAISE(ABORT, 'audit_events is append-only: DELETE refused'); END`);
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const sequelize = qi.sequelize;
  if (sequelize.getDialect() === 'postgres') {
    await sequelize.query('DROP TRIGGER IF EXISTS audit_events_no_truncate ON audit_events');
    await sequelize.query('DROP TRIGGER IF EXISTS audit_events_no_change ON audit_events');
    await sequelize.query('DROP FUNCTION IF EXISTS audit_events_append_only()');
  } else {
    await sequelize.query('DROP TRIGGER IF EXISTS audit_events_no_delete');
    await sequelize.query('DROP TRIGGER IF EXISTS audit_events_no_update');
  }
}
