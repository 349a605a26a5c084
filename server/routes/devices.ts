import { z } from 'zod';
import {
  bandCsvResponseSchema,
  deviceTypeInputSchema,
  deviceTypeListSchema,
  deviceTypeSchema,
} from '../../shared/schemas/deviceLibrary';
import { parseBandCsv } from '../engine/trip';
import { ApiError } from '../http/errors';
import { defineRoute, type AnyRoute } from '../http/route';
import { singleFileUpload } from '../http/upload';
import {
  createDeviceType,
  deleteDeviceType,
  getDeviceType,
  listDeviceTypes,
  updateDeviceType,
} from '../services/deviceTypes';

const csvUpload = singleFileUpload({
  field: 'file',
  maxBytes: 512 * 1024,
  what: 'a CSV file',
  accept: (mime, name) =>
    /^(text\/(csv|plain)|application\/(vnd\.ms-excel|csv|octet-stream))$/.test(mime) || /\.(csv|txt)$/i.test(name),
});

export const deviceRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/device-types',
    summary: 'The organization’s device library.',
    tag: 'devices',
    access: 'signed-in',
    response: deviceTypeListSchema,
    handler: async ({ user }) => ({ deviceTypes: await listDeviceTypes(user) }),
  }),
  defineRoute({
    method: 'post',
    path: '/device-types',
    summary: 'Add a device type (any of the five kinds).',
    tag: 'devices',
    access: ['engineer'],
    body: deviceTypeInputSchema,
    response: deviceTypeSchema,
    status: 201,
    handler: ({ ctx, user, body }) => createDeviceType(ctx, user, body),
  }),
  defineRoute({
    method: 'get',
    path: '/device-types/:deviceTypeId',
    summary: 'One device type, with its settings resolved to numbers.',
    tag: 'devices',
    access: 'signed-in',
    response: deviceTypeSchema,
    handler: ({ user, params }) => getDeviceType(user, params.deviceTypeId),
  }),
  defineRoute({
    method: 'put',
    path: '/device-types/:deviceTypeId',
    summary: 'Edit a device type.',
    tag: 'devices',
    access: ['engineer'],
    body: deviceTypeInputSchema,
    response: deviceTypeSchema,
    handler: ({ ctx, user, body, params }) => updateDeviceType(ctx, user, params.deviceTypeId, body),
  }),
  defineRoute({
    method: 'delete',
    path: '/device-types/:deviceTypeId',
    summary: 'Remove a device type from the library (studies keep their own copy).',
    tag: 'devices',
    access: ['engineer'],
    handler: async ({ ctx, user, params }) => {
      await deleteDeviceType(ctx, user, params.deviceTypeId);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/device-types/parse-band-csv',
    summary:
      'Read a digitized band from a CSV upload (multipart field "file"; columns current or multiple, minimum seconds, maximum seconds). ' +
      'Errors name the line.',
    tag: 'devices',
    access: ['engineer'],
    middleware: [csvUpload],
    query: z.object({ currentUnit: z.enum(['multiple', 'ampere']).optional() }),
    response: bandCsvResponseSchema,
    handler: ({ req, query }) => {
      const text = (req.file as Express.Multer.File).buffer.toString('utf8');
      const result = parseBandCsv(text, { currentUnit: query.currentUnit });
      if (!result.ok) {
        const fields: Record<string, string> = {};
        for (const e of result.errors) fields[`line ${e.line}`] = e.message;
        const first = result.errors[0];
        throw new ApiError(
          'bad_request',
          `The CSV has ${result.errors.length} problem${result.errors.length === 1 ? '' : 's'}; line ${first.line}: ${first.message}`,
          fields,
        );
      }
      return { currentUnit: result.currentUnit, min: result.min, max: result.max };
    },
  }),
];
