import type { QueryInterface } from 'sequelize';

/**
 * Covering indexes for the small columns of a run (its DTO). The large columns (model snapshot, settings, results:
 * megabytes for a large study) sit before `startedAt` and `finishedAt` in the table, so on SQLite reading those
 * from the row walks every overflow page of the results; every results page, bus trace, study view and run poll
 * reads them. With the columns in an index the row is never read for them.
 */
const DTO = ['organizationId', 'modelVersion', 'progress', 'message', 'startedAt', 'finishedAt'];

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  // The latest finished run of a study; the latest run of any status, or one run of a study by its id.
  await qi.addIndex('study_runs', ['studyId', 'status', 'startedAt', 'id', ...DTO.filter((c) => c !== 'startedAt')], {
    name: 'study_runs_study_status_dto',
  });
  await qi.addIndex('study_runs', ['studyId', 'startedAt', 'id', 'status', ...DTO.filter((c) => c !== 'startedAt')], {
    name: 'study_runs_study_started_dto',
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeIndex('study_runs', 'study_runs_study_started_dto');
  await qi.removeIndex('study_runs', 'study_runs_study_status_dto');
}
