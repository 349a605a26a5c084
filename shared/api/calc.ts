import { clearingTimeRequestSchema, clearingTimeResponseSchema, deviceSchema } from '../schemas/device';
import {
  bandCurvesRequestSchema,
  bandCurvesResponseSchema,
  resolveTripUnitRequestSchema,
} from '../schemas/deviceLibrary';
import { z } from 'zod';
import { incidentEnergyRequestSchema, incidentEnergyResponseSchema } from '../schemas/incidentEnergy';
import { labelValuesSchema } from '../schemas/labelValues';
import { modelSchema } from '../schemas/model';
import { endpoint } from './endpoint';

/** Stateless calculators: clearing time, band curves, trip units, incident energy, short circuit. */
export const calcApi = {
  clearingTime: endpoint({
    method: 'post',
    path: '/calc/clearing-time',
    summary:
      'Clearing time of a protective device at a current: the maximum (total clearing) curve time, the minimum curve time, ' +
      'the region of the band, and warnings. Device kinds: relay, fuse, band, thermal-magnetic, electronic.',
    tag: 'calc',
    access: 'signed-in',
    body: clearingTimeRequestSchema,
    response: clearingTimeResponseSchema,
  }),
  bandCurves: endpoint({
    method: 'post',
    path: '/calc/band-curves',
    summary: 'A device’s minimum and maximum curves sampled for plotting, amperes against seconds.',
    tag: 'calc',
    access: 'signed-in',
    body: bandCurvesRequestSchema,
    response: bandCurvesResponseSchema,
  }),
  resolveTripUnit: endpoint({
    method: 'post',
    path: '/calc/resolve-trip-unit',
    summary: 'An electronic trip unit’s switch positions resolved to the numbers the engine uses.',
    tag: 'calc',
    access: 'signed-in',
    body: resolveTripUnitRequestSchema,
    response: z.object({ device: deviceSchema }),
  }),
  incidentEnergy: endpoint({
    method: 'post',
    path: '/calc/incident-energy',
    summary:
      'IEEE 1584-2018 arcing currents, incident energy and arc-flash boundary of one equipment (both the full and the reduced ' +
      'arcing current, each with its own arc duration; the larger energy governs), plus the label values under the organization’s settings. ' +
      'Voltage outside 208 V–15 kV → 422.',
    tag: 'calc',
    access: 'signed-in',
    body: incidentEnergyRequestSchema,
    response: incidentEnergyResponseSchema.extend({ labelValues: labelValuesSchema }),
  }),
  shortCircuit: endpoint({
    method: 'post',
    path: '/calc/short-circuit',
    summary:
      'Three-phase bolted fault current (symmetrical rms, kA) and X/R at every bus of a system model. ' +
      'A bad model → 400 naming every element and field.',
    tag: 'calc',
    access: 'signed-in',
    body: z.object({ model: modelSchema }).meta({ id: 'ShortCircuitRequest' }),
    response: z
      .object({
        prefaultPu: z.number(),
        buses: z.array(z.object({ id: z.string(), nominalKv: z.number(), boltedFaultKa: z.number(), xr: z.number() })),
        warnings: z.array(z.object({ code: z.string(), message: z.string() })),
      })
      .meta({ id: 'ShortCircuitResponse' }),
  }),
};
