import { rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import { labelCheckSchema, labelSchema } from '../../shared/schemas/labels';
import { ApiError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import {
  checkLabel,
  listLabels,
  markInstalled,
  normalizeCode,
  REPORT_KINDS,
  reportMismatch,
  toLabelDtos,
} from '../services/labels';
import { makeFileKey } from '../storage';
import { qrPng } from '../pdf/qr';
import { checkUrl } from '../services/labelBatches';
import { imageExtension, imageUpload } from '../storage/imageUpload';
import { Label } from '../db/models';
import type { AppContext, AuthUser } from '../http/context';

const labelList = z.object({ labels: z.array(labelSchema) });

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
    defineRoute({
      method: 'get',
      path: '/labels/:code',
      summary:
        'Public check of a printed label (no sign-in): what it says and whether it is current, superseded (with the current values) or past review.',
      tag: 'labels',
      access: 'public',
      before: [checkLimiter],
      response: labelCheckSchema,
      handler: ({ ctx, params }) => checkLabel(ctx, params.code),
    }),
    defineRoute({
      method: 'get',
      path: '/labels/:code/qr.png',
      summary: 'The QR code printed on a label (PNG): it holds the public check address.',
      tag: 'labels',
      access: 'public',
      before: [checkLimiter],
      produces: 'image/png',
      handler: async ({ ctx, params, res }) => {
        const label = await Label.findOne({ where: { code: normalizeCode(params.code) } });
        if (!label) throw ApiError.notFound('No label has this code');
        res.setHeader('Content-Type', 'image/png');
        res.setHeader('Cache-Control', 'public, max-age=86400');
        res.send(await qrPng(checkUrl(ctx, label.code), 4));
      },
    }),
    defineRoute({
      method: 'get',
      path: '/labels/:code/detail',
      summary: 'A label of the organization with its print and install status (signed-in).',
      tag: 'labels',
      access: 'signed-in',
      response: labelSchema,
      handler: async ({ ctx, user, params }) =>
        (await toLabelDtos([await findLabelByCode(user, params.code)], ctx.now()))[0],
    }),
    defineRoute({
      method: 'get',
      path: '/sites/:siteId/labels',
      summary: 'Labels issued for a site (current=1: only those not superseded).',
      tag: 'labels',
      access: 'signed-in',
      query: z.object({ current: z.enum(['0', '1']).optional() }),
      response: labelList,
      handler: async ({ ctx, user, params, query }) => ({
        labels: await listLabels(ctx, user, { siteId: params.siteId, current: query.current === '1' }),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/studies/:studyId/labels',
      summary: 'Labels issued by one approved revision.',
      tag: 'labels',
      access: 'signed-in',
      response: labelList,
      handler: async ({ ctx, user, params }) => ({ labels: await listLabels(ctx, user, { studyId: params.studyId }) }),
    }),
  ];
}

const reportSchema = z.object({
  kind: z.enum(REPORT_KINDS, { error: 'Choose what does not match' }),
  text: z.string().trim().min(3, 'Say what does not match').max(4000),
});

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
  defineRoute({
    method: 'post',
    path: '/labels/:code/installed',
    summary:
      'Mark a label installed, with a photo of it in place (multipart field "photo": JPEG or PNG, at most 10 MB; stored re-encoded, without metadata).',
    tag: 'labels',
    access: ['electrician', 'engineer'],
    middleware: [imageUpload('photo', { required: true })],
    response: labelSchema,
    handler: async ({ ctx, user, params, req }) => {
      const label = await findLabelByCode(user, params.code);
      const key = await storePhoto(ctx, user, req.file);
      return markInstalled(ctx, user, label.id, key);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/labels/:code/reports',
    summary: 'Report what does not match a label (multipart: kind, text, optional photo).',
    tag: 'labels',
    access: ['electrician', 'engineer', 'safety'],
    middleware: [imageUpload('photo', { required: false })],
    body: reportSchema,
    response: z.object({ id: z.string(), status: z.string() }),
    status: 201,
    handler: async ({ ctx, user, params, req, body }) => {
      const label = await findLabelByCode(user, params.code);
      const key = await storePhoto(ctx, user, req.file);
      return reportMismatch(ctx, user, label.id, body, key);
    },
  }),
];
