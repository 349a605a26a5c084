import rateLimit from 'express-rate-limit';
import { z } from 'zod';
import { labelCheckSchema, labelSchema } from '../../shared/schemas/labels';
import { ApiError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import { checkLabel, listLabels, normalizeCode, toLabelDtos } from '../services/labels';
import { Label } from '../db/models';
import type { AuthUser } from '../http/context';

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
    handler: (_req, res) => res.status(429).json({ error: { code: 'rate_limited', message: 'Too many label checks from here; wait a minute' } }),
  });
  return [
    defineRoute({
      method: 'get',
      path: '/labels/:code',
      summary: 'Public check of a printed label (no sign-in): what it says and whether it is current, superseded (with the current values) or past review.',
      tag: 'labels',
      access: 'public',
      before: [checkLimiter],
      response: labelCheckSchema,
      handler: ({ ctx, params }) => checkLabel(ctx, params.code),
    }),
    defineRoute({
      method: 'get',
      path: '/labels/:code/detail',
      summary: 'A label of the organization with its print and install status (signed-in).',
      tag: 'labels',
      access: 'signed-in',
      response: labelSchema,
      handler: async ({ ctx, user, params }) => (await toLabelDtos([await findLabelByCode(user, params.code)], ctx.now()))[0],
    }),
    defineRoute({
      method: 'get',
      path: '/sites/:siteId/labels',
      summary: 'Labels issued for a site (current=1: only those not superseded).',
      tag: 'labels',
      access: 'signed-in',
      query: z.object({ current: z.enum(['0', '1']).optional() }),
      response: labelList,
      handler: async ({ ctx, user, params, query }) => ({ labels: await listLabels(ctx, user, { siteId: params.siteId, current: query.current === '1' }) }),
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
