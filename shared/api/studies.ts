import { z } from 'zod';
import {
  approveSchema,
  createStudySchema,
  equipmentSchema,
  modelEnvelopeSchema,
  putModelSchema,
  runSchema,
  studyListSchema,
  studySchema,
} from '../schemas/studies';
import {
  busResultQuerySchema,
  busResultResponseSchema,
  resultsPageQuerySchema,
  resultsPageSchema,
} from '../schemas/resultsPage';
import { endpoint } from './endpoint';

/** Roles of the routes below that share one access rule. */
const ENGINEER = ['engineer'] as const;

/** Studies: revisions, the system model, runs, results, review and approval, import and export. */
export const studiesApi = {
  list: endpoint({
    method: 'get',
    path: '/sites/:siteId/studies',
    summary: 'Study revisions of a site, newest first (electricians see approved and superseded revisions only).',
    tag: 'studies',
    access: 'signed-in',
    response: studyListSchema,
  }),
  create: endpoint({
    method: 'post',
    path: '/sites/:siteId/studies',
    summary: 'Start a study of a site (a new draft revision with an empty model).',
    tag: 'studies',
    access: ENGINEER,
    body: createStudySchema,
    response: studySchema,
    status: 201,
  }),
  equipment: endpoint({
    method: 'get',
    path: '/sites/:siteId/equipment',
    summary: 'The site’s equipment that carries labels (from its approved studies).',
    tag: 'studies',
    access: 'signed-in',
    response: z.object({ equipment: z.array(equipmentSchema) }),
  }),
  get: endpoint({
    method: 'get',
    path: '/studies/:studyId',
    summary: 'One study revision: status, approval, review date, staleness, latest run.',
    tag: 'studies',
    access: 'signed-in',
    response: studySchema,
  }),
  model: endpoint({
    method: 'get',
    path: '/studies/:studyId/model',
    summary: 'The system model of a revision, its version, and its problems (element and field named).',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    response: modelEnvelopeSchema,
  }),
  saveModel: endpoint({
    method: 'put',
    path: '/studies/:studyId/model',
    summary:
      'Save the model of a draft. Send the version you read: 409 when another edit came first (nothing is lost).',
    tag: 'studies',
    access: ENGINEER,
    body: putModelSchema,
    response: modelEnvelopeSchema,
  }),
  startRun: endpoint({
    method: 'post',
    path: '/studies/:studyId/run',
    summary: 'Run the study on the current model (a background job; poll GET /studies/:id/run for progress).',
    tag: 'studies',
    access: ENGINEER,
    response: runSchema,
    status: 202,
  }),
  run: endpoint({
    method: 'get',
    path: '/studies/:studyId/run',
    summary: 'The latest run of a study and its progress.',
    tag: 'studies',
    access: 'signed-in',
    response: runSchema,
  }),
  results: endpoint({
    method: 'get',
    path: '/studies/:studyId/results',
    summary:
      'One page of the results, without clearing traces: sorted and filtered rows, the paging, the run, and counts ' +
      'over the whole study. ETag per run and query (304 on a match).',
    tag: 'studies',
    access: 'signed-in',
    query: resultsPageQuerySchema,
    response: resultsPageSchema,
  }),
  busResult: endpoint({
    method: 'get',
    path: '/studies/:studyId/results/buses/:busId',
    summary:
      'One bus of the results with its whole clearing trace and the model devices it names (404: no such bus); ' +
      '`scenario` for its trace in another operating scenario. ETag per run, bus and scenario (304 on a match).',
    tag: 'studies',
    access: 'signed-in',
    query: busResultQuerySchema,
    response: busResultResponseSchema,
  }),
  submit: endpoint({
    method: 'post',
    path: '/studies/:studyId/submit',
    summary: 'Submit a draft for review (its latest run must be on the current model).',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
  }),
  returnToDraft: endpoint({
    method: 'post',
    path: '/studies/:studyId/return-to-draft',
    summary: 'Send a revision in review back to draft for changes.',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
  }),
  approve: endpoint({
    method: 'post',
    path: '/studies/:studyId/approve',
    summary:
      'Approve a revision in review (name, licence number and jurisdiction recorded); supersedes the previous approved revision.',
    tag: 'studies',
    access: ENGINEER,
    body: approveSchema,
    response: studySchema,
  }),
  revise: endpoint({
    method: 'post',
    path: '/studies/:studyId/revise',
    summary: 'Start a new draft revision copied from an approved (or superseded) one.',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
    status: 201,
  }),
  importModel: endpoint({
    method: 'post',
    path: '/studies/:studyId/import',
    summary:
      'Replace a draft’s model from a workbook (.xlsx, one sheet per element type), CSV files (one per element type) or a JSON model ' +
      '(multipart field "files"). Nothing is written unless the whole import is valid; errors name the sheet or file, row and column.',
    tag: 'studies',
    access: ENGINEER,
    response: modelEnvelopeSchema,
  }),
  exportModel: endpoint({
    method: 'get',
    path: '/studies/:studyId/export',
    summary: 'Download the model as JSON, a workbook (.xlsx), or one CSV table (format=csv&element=buses|sources|…).',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: z.object({
      format: z.enum(['json', 'xlsx', 'csv']).default('json'),
      element: z
        .enum(['about', 'buses', 'sources', 'transformers', 'cables', 'motors', 'ties', 'devices', 'scenarios'])
        .optional(),
    }),
    produces: 'application/octet-stream',
  }),
};
