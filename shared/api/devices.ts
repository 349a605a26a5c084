import { z } from 'zod';
import {
  bandCsvResponseSchema,
  deviceTypeInputSchema,
  deviceTypeListSchema,
  deviceTypeSchema,
} from '../schemas/deviceLibrary';
import { endpoint } from './endpoint';

/** The organization's library of protective device types. */
export const devicesApi = {
  list: endpoint({
    method: 'get',
    path: '/device-types',
    summary: 'The organization’s device library.',
    tag: 'devices',
    access: 'signed-in',
    response: deviceTypeListSchema,
  }),
  create: endpoint({
    method: 'post',
    path: '/device-types',
    summary: 'Add a device type (any of the five kinds).',
    tag: 'devices',
    access: ['engineer'],
    body: deviceTypeInputSchema,
    response: deviceTypeSchema,
    status: 201,
  }),
  get: endpoint({
    method: 'get',
    path: '/device-types/:deviceTypeId',
    summary: 'One device type, with its settings resolved to numbers.',
    tag: 'devices',
    access: 'signed-in',
    response: deviceTypeSchema,
  }),
  update: endpoint({
    method: 'put',
    path: '/device-types/:deviceTypeId',
    summary: 'Edit a device type.',
    tag: 'devices',
    access: ['engineer'],
    body: deviceTypeInputSchema,
    response: deviceTypeSchema,
  }),
  remove: endpoint({
    method: 'delete',
    path: '/device-types/:deviceTypeId',
    summary: 'Remove a device type from the library (studies keep their own copy).',
    tag: 'devices',
    access: ['engineer'],
  }),
  parseBandCsv: endpoint({
    method: 'post',
    path: '/device-types/parse-band-csv',
    summary:
      'Read a digitized band from a CSV upload (multipart field "file"; columns current or multiple, minimum seconds, maximum seconds). ' +
      'Errors name the line.',
    tag: 'devices',
    access: ['engineer'],
    query: z.object({ currentUnit: z.enum(['multiple', 'ampere']).optional() }),
    response: bandCsvResponseSchema,
  }),
};
