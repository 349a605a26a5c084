import { rateLimit } from 'express-rate-limit';
import { ApiError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { checkLabel, listLabels, markInstalled, normalizeCode, reportMismatch, toLabelDtos } from '../services/labels';
import { makeFileKey } from '../storage';
import { qrPng } from '../pdf/qr';
import { checkUrl } from '../services/labelBatches';
import { imageExtension, imageUpload } from '../storage/imageUpload';
import { Label } from '../db/models';
import type { AppContext, AuthUser } from '../services/context';

export async function findLabelByCode(actor: AuthUser, code: string): Promise<Label> {
  const label = await Label.findOne({ where: { code: normalizeCode(code), organizationId: actor.organizationId } });
  if (!label) throw ApiError.notFound('No label of your organization has this code');
  return label;
}

export function labelRoutes(opts: { publicCheckPerMinute: number }): AnyRoute[] {
  const checkLimiter = rateLimit({
    windowMs: 60_000,
    limit: opts.publicCheckPerMinute,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: (_req, res) =>
      res
        .status(429)
        .json({ error: { code: 'rate_limited', message: 'Too many label checks from here; wait a minute' } }),
  });
  return [
    bind(contract.labels.check, {
      before: [checkLimiter],
      handler: ({ ctx, params }) => checkLabel(ctx, params.code),
    }),
    bind(contract.labels.qr, {
      before: [checkLimiter],
      handler: async ({ ctx, params, res }) => {
        const label = await Label.findOne({ where: { code: normalizeCode(params.code) } });
        if (!label) throw ApiError.notFound('No label has this code');
        res.setHeader('Content-Type', 'image/png');
        res.setHeader('Cache-Control', 'public, max-age=86400');
        res.send(await qrPng(checkUrl(ctx, label.code), 4));
      },
    }),
    bind(contract.labels.detail, {
      handler: async ({ ctx, user, params }) =>
        (await toLabelDtos([await findLabelByCode(user, params.code)], ctx.now()))[0],
    }),
    bind(contract.labels.siteLabels, {
      handler: async ({ ctx, user, params, query }) => ({
        labels: await listLabels(ctx, user, { siteId: params.siteId, current: query.current === '1' }),
      }),
    }),
    bind(contract.labels.studyLabels, {
      handler: async ({ ctx, user, params }) => ({ labels: await listLabels(ctx, user, { studyId: params.studyId }) }),
    }),
  ];
}

async function storePhoto(
  ctx: AppContext,
  user: AuthUser,
  file: Express.Multer.File | undefined,
): Promise<string | null> {
  if (!file) return null;
  const key = makeFileKey(user.organizationId, imageExtension(file.buffer) ?? 'bin');
  await ctx.storage.put(key, file.buffer, file.mimetype);
  return key;
}

/** Field actions on a label, by the code read from it. */
export const labelFieldRoutes: AnyRoute[] = [
  bind(contract.labels.markInstalled, {
    middleware: [imageUpload('photo', { required: true })],
    handler: async ({ ctx, user, params, req }) => {
      const label = await findLabelByCode(user, params.code);
      const key = await storePhoto(ctx, user, req.file);
      return markInstalled(ctx, user, label.id, key);
    },
  }),
  bind(contract.labels.report, {
    middleware: [imageUpload('photo', { required: false })],
    handler: async ({ ctx, user, params, req, body }) => {
      const label = await findLabelByCode(user, params.code);
      const key = await storePhoto(ctx, user, req.file);
      return reportMismatch(ctx, user, label.id, body, key);
    },
  }),
];
