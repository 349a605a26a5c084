import { parseModel } from '../../shared/schemas/model';
import { ApiError, modelIssuesError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { multiFileUpload } from '../http/upload';
import { exportModel, importModel } from '../io';
import { UnsafeArchiveError } from '../io/zipGuard';
import { busResultTagged, resultsPageTagged } from '../services/results';
import { sendTagged } from '../http/tagged';
import { latestRun, startRun } from '../services/runs';
import { markAcceptedModel } from '../services/modelCheck';
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

export const studyRoutes: AnyRoute[] = [
  bind(contract.studies.list, {
    handler: async ({ ctx, user, params }) => ({ studies: await listStudies(ctx, user, params.siteId) }),
  }),
  bind(contract.studies.create, {
    handler: ({ ctx, user, params, body }) => createStudy(ctx, user, params.siteId, body),
  }),
  bind(contract.studies.equipment, {
    handler: async ({ user, params }) => ({ equipment: await listEquipment(user, params.siteId) }),
  }),
  bind(contract.studies.get, {
    handler: ({ ctx, user, params }) => getStudyDto(ctx, user, params.studyId),
  }),
  bind(contract.studies.model, {
    handler: ({ user, params }) => getModelEnvelope(user, params.studyId),
  }),
  bind(contract.studies.saveModel, {
    // A 10 000-bus model is about 5.5 MB of JSON; room for several times that.
    jsonLimit: '25mb',
    handler: ({ ctx, user, params, body }) => saveModel(ctx, user, params.studyId, body.model, body.version),
  }),
  bind(contract.studies.startRun, {
    handler: ({ ctx, user, params }) => startRun(ctx, user, params.studyId),
  }),
  bind(contract.studies.run, {
    handler: ({ user, params }) => latestRun(user, params.studyId),
  }),
  bind(contract.studies.results, {
    // Sent by the service with its ETag (the schema above documents the body).
    respond: async ({ req, res, user, params, query }) =>
      sendTagged(req, res, await resultsPageTagged(user, params.studyId, query)),
  }),
  bind(contract.studies.busResult, {
    respond: async ({ req, res, user, params, query }) =>
      sendTagged(req, res, await busResultTagged(user, params.studyId, params.busId, query.scenario)),
  }),
  bind(contract.studies.submit, {
    handler: ({ ctx, user, params }) => submitForReview(ctx, user, params.studyId),
  }),
  bind(contract.studies.returnToDraft, {
    handler: ({ ctx, user, params }) => returnToDraft(ctx, user, params.studyId),
  }),
  bind(contract.studies.approve, {
    handler: ({ ctx, user, params, body }) => approveStudy(ctx, user, params.studyId, body),
  }),
  bind(contract.studies.revise, {
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
  bind(contract.studies.importModel, {
    middleware: [modelFiles],
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
      // Checked as it was read (parseModel): not parsed and checked again when it is stored.
      markAcceptedModel(result.model);
      return saveModel(ctx, user, params.studyId, result.model, null, 'study.model-imported', {
        files: files.map((f) => f.name),
      });
    },
  }),
  bind(contract.studies.exportModel, {
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
