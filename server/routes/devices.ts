import { parseBandCsv } from '../engine/trip';
import { ApiError } from '../services/errors';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
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
  bind(contract.devices.list, {
    handler: async ({ user }) => ({ deviceTypes: await listDeviceTypes(user) }),
  }),
  bind(contract.devices.create, {
    handler: ({ ctx, user, body }) => createDeviceType(ctx, user, body),
  }),
  bind(contract.devices.get, {
    handler: ({ user, params }) => getDeviceType(user, params.deviceTypeId),
  }),
  bind(contract.devices.update, {
    handler: ({ ctx, user, body, params }) => updateDeviceType(ctx, user, params.deviceTypeId, body),
  }),
  bind(contract.devices.remove, {
    handler: async ({ ctx, user, params }) => {
      await deleteDeviceType(ctx, user, params.deviceTypeId);
    },
  }),
  bind(contract.devices.parseBandCsv, {
    middleware: [csvUpload],
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
