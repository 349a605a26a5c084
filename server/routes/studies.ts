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
} from '../../shared/schemas/studies';
import { parseModel } from '../../shared/schemas/model';
import { busResultResponseSchema, resultsPageQuerySchema, resultsPageSchema } from '../../shared/schemas/resultsPage';
import { ApiError, modelIssuesError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import { multiFileUpload } from '../http/upload';
import { exportModel, importModel } from '../io';
import { UnsafeArchiveError } from '../io/zipGuard';
import { sendBusResult, sendResultsPage } from '../services/results';
import { latestRun, startRun } from '../services/runs';
import {
  approveStudy,
  createStudy,
  getModelEnvelope,
  getStudyDto,
  listEquipment,
  listStudies,
  newRevision,
  returnToDraft,
  saveModel,
  submitForReview,
} from '../services/studies';

const ENGINEER = ['engineer'] as const;

export const studyRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/sites/:siteId/studies',
    summary: 'Study revisions of a site, newest first (electricians see approved and superseded revisions only).',
    tag: 'studies',
    access: 'signed-in',
    response: studyListSchema,
    handler: async ({ ctx, user, params }) => ({ studies: await listStudies(ctx, user, params.siteId) }),
  }),
  defineRoute({
    method: 'post',
    path: '/sites/:siteId/studies',
    summary: 'Start a study of a site (a new draft revision with an empty model).',
    tag: 'studies',
    access: ENGINEER,
    body: createStudySchema,
    response: studySchema,
    status: 201,
    handler: ({ ctx, user, params, body }) => createStudy(ctx, user, params.siteId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/sites/:siteId/equipment',
    summary: 'The site’s equipment that carries labels (from its approved studies).',
    tag: 'studies',
    access: 'signed-in',
    response: z.object({ equipment: z.array(equipmentSchema) }),
    handler: async ({ user, params }) => ({ equipment: await listEquipment(user, params.siteId) }),
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId',
    summary: 'One study revision: status, approval, review date, staleness, latest run.',
    tag: 'studies',
    access: 'signed-in',
    response: studySchema,
    handler: ({ ctx, user, params }) => getStudyDto(ctx, user, params.studyId),
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/model',
    summary: 'The system model of a revision, its version, and its problems (element and field named).',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    response: modelEnvelopeSchema,
    handler: ({ user, params }) => getModelEnvelope(user, params.studyId),
  }),
  defineRoute({
    method: 'put',
    path: '/studies/:studyId/model',
    summary:
      'Save the model of a draft. Send the version you read: 409 when another edit came first (nothing is lost).',
    tag: 'studies',
    access: ENGINEER,
    // A 10 000-bus model is about 5.5 MB of JSON; room for several times that.
    jsonLimit: '25mb',
    body: putModelSchema,
    response: modelEnvelopeSchema,
    handler: ({ ctx, user, params, body }) => saveModel(ctx, user, params.studyId, body.model, body.version),
  }),
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/run',
    summary: 'Run the study on the current model (a background job; poll GET /studies/:id/run for progress).',
    tag: 'studies',
    access: ENGINEER,
    response: runSchema,
    status: 202,
    handler: ({ ctx, user, params }) => startRun(ctx, user, params.studyId),
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/run',
    summary: 'The latest run of a study and its progress.',
    tag: 'studies',
    access: 'signed-in',
    response: runSchema,
    handler: ({ user, params }) => latestRun(user, params.studyId),
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/results',
    summary:
      'One page of the results, without clearing traces: sorted and filtered rows, the paging, the run, and counts ' +
      'over the whole study. ETag per run and query (304 on a match).',
    tag: 'studies',
    access: 'signed-in',
    query: resultsPageQuerySchema,
    response: resultsPageSchema,
    // Sent by the service with its ETag (the schema above documents the body).
    handler: ({ req, res, user, params, query }) => sendResultsPage(req, res, user, params.studyId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/results/buses/:busId',
    summary: 'One bus of the results with its whole clearing trace and the model devices it names (404: no such bus).',
    tag: 'studies',
    access: 'signed-in',
    response: busResultResponseSchema,
    handler: ({ req, res, user, params }) => sendBusResult(req, res, user, params.studyId, params.busId),
  }),
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/submit',
    summary: 'Submit a draft for review (its latest run must be on the current model).',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
    handler: ({ ctx, user, params }) => submitForReview(ctx, user, params.studyId),
  }),
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/return-to-draft',
    summary: 'Send a revision in review back to draft for changes.',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
    handler: ({ ctx, user, params }) => returnToDraft(ctx, user, params.studyId),
  }),
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/approve',
    summary:
      'Approve a revision in review (name, licence number and jurisdiction recorded); supersedes the previous approved revision.',
    tag: 'studies',
    access: ENGINEER,
    body: approveSchema,
    response: studySchema,
    handler: ({ ctx, user, params, body }) => approveStudy(ctx, user, params.studyId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/revise',
    summary: 'Start a new draft revision copied from an approved (or superseded) one.',
    tag: 'studies',
    access: ENGINEER,
    response: studySchema,
    status: 201,
    handler: ({ ctx, user, params }) => newRevision(ctx, user, params.studyId),
  }),
];

const modelFiles = multiFileUpload({
  field: 'files',
  maxFiles: 10,
  maxBytes: 20 * 1024 * 1024,
  what: 'a workbook (.xlsx), CSV files or a JSON model',
  accept: (_mime, name) => /\.(xlsx|csv|json)$/i.test(name),
});

export const studyIoRoutes: AnyRoute[] = [
  defineRoute({
    method: 'post',
    path: '/studies/:studyId/import',
    summary:
      'Replace a draft’s model from a workbook (.xlsx, one sheet per element type), CSV files (one per element type) or a JSON model ' +
      '(multipart field "files"). Nothing is written unless the whole import is valid; errors name the sheet or file, row and column.',
    tag: 'studies',
    access: ENGINEER,
    middleware: [modelFiles],
    response: modelEnvelopeSchema,
    handler: async ({ ctx, user, params, req }) => {
      const files = (req.files as Express.Multer.File[]).map((f) => ({
        name: f.originalname,
        mimeType: f.mimetype,
        buffer: f.buffer,
      }));
      let result: Awaited<ReturnType<typeof importModel>>;
      try {
        result = await importModel(files);
      } catch (e) {
        if (!(e instanceof UnsafeArchiveError)) throw e;
        throw new ApiError(e.status === 413 ? 'payload_too_large' : 'unprocessable', e.message, { files: e.message });
      }
      if (!result.ok) {
        const fields: Record<string, string> = {};
        for (const e of result.errors) fields[e.where] ??= e.message;
        const first = result.errors[0];
        throw new ApiError(
          'bad_request',
          `The import has ${result.errors.length} problem${result.errors.length === 1 ? '' : 's'}; nothing was changed. ${first.where}: ${first.message}`,
          fields,
        );
      }
      return saveModel(
        ctx,
        user,
        params.studyId,
        result.model as unknown as Record<string, unknown>,
        null,
        'study.model-imported',
        {
          files: files.map((f) => f.name),
        },
      );
    },
  }),
  defineRoute({
    method: 'get',
    path: '/studies/:studyId/export',
    summary: 'Download the model as JSON, a workbook (.xlsx), or one CSV table (format=csv&element=buses|sources|…).',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: z.object({
      format: z.enum(['json', 'xlsx', 'csv']).default('json'),
      element: z.enum(['about', 'buses', 'sources', 'transformers', 'cables', 'motors', 'ties', 'devices']).optional(),
    }),
    produces: 'application/octet-stream',
    handler: async ({ user, params, query, res }) => {
      const envelope = await getModelEnvelope(user, params.studyId);
      const parsed = parseModel(envelope.model);
      if (!parsed.success) throw modelIssuesError(parsed.issues, 'model.');
      if (query.format === 'csv' && !query.element)
        throw new ApiError('bad_request', 'Name the table to export as CSV', { element: 'Required with format=csv' });
      const file = await exportModel(parsed.model, query.format, query.element);
      res.setHeader('Content-Type', file.mimeType);
      res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
      res.send(file.body);
    },
  }),
];
