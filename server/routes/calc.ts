import { clearingTimeRequestSchema, clearingTimeResponseSchema, deviceSchema } from '../../shared/schemas/device';
import {
  bandCurvesRequestSchema,
  bandCurvesResponseSchema,
  resolveTripUnitRequestSchema,
} from '../../shared/schemas/deviceLibrary';
import { z } from 'zod';
import { bandCurves, clearingTime, resolveElectronicSettings } from '../engine/trip';
import { defineRoute, type AnyRoute } from '../http/route';
import { incidentEnergyRequestSchema, incidentEnergyResponseSchema } from '../../shared/schemas/incidentEnergy';
import { labelValuesSchema } from '../../shared/schemas/labelValues';
import { computeIncidentEnergy } from '../engine/ieee1584';
import { InvalidModelError, shortCircuit } from '../engine/shortcircuit';
import { modelIssuesError } from '../http/errors';
import { modelSchema } from '../../shared/schemas/model';
import { computeLabelValues } from '../engine/labelValues';
import { getSettings, labelSettingsOf } from '../services/organization';

/** Stateless calculation routes: any signed-in role may call them. */
export const calcRoutes: AnyRoute[] = [
  defineRoute({
    method: 'post',
    path: '/calc/clearing-time',
    summary:
      'Clearing time of a protective device at a current: the maximum (total clearing) curve time, the minimum curve time, ' +
      'the region of the band, and warnings. Device kinds: relay, fuse, band, thermal-magnetic, electronic.',
    tag: 'calc',
    access: 'signed-in',
    body: clearingTimeRequestSchema,
    response: clearingTimeResponseSchema,
    handler: ({ body }) => {
      const r = clearingTime(body.device, body.currentA);
      return {
        clearingTimeS: r.clearingTimeS,
        minimumTimeS: r.minimumTimeS,
        region: r.region,
        warnings: r.warnings,
        trace: r.trace as unknown as Record<string, unknown>,
      };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/calc/band-curves',
    summary: 'A device’s minimum and maximum curves sampled for plotting, amperes against seconds.',
    tag: 'calc',
    access: 'signed-in',
    body: bandCurvesRequestSchema,
    response: bandCurvesResponseSchema,
    handler: ({ body }) => bandCurves(body.device, { fromA: body.fromA, toA: body.toA }),
  }),
  defineRoute({
    method: 'post',
    path: '/calc/resolve-trip-unit',
    summary: 'An electronic trip unit’s switch positions resolved to the numbers the engine uses.',
    tag: 'calc',
    access: 'signed-in',
    body: resolveTripUnitRequestSchema,
    response: z.object({ device: deviceSchema }),
    handler: ({ body }) => ({ device: resolveElectronicSettings(body.tripType, body.positions) }),
  }),
];

/** Incident energy plus the label values under the organization's settings. */
export const incidentEnergyRoute = defineRoute({
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
  handler: async ({ body, user }) => {
    const settings = await getSettings(user.organizationId);
    const result = computeIncidentEnergy({
      ...body,
      maxArcDurationMs: body.maxArcDurationMs ?? settings.maxArcDurationMs,
    });
    return { ...result, labelValues: computeLabelValues(result, body.voltageV, labelSettingsOf(settings)) };
  },
});

export const shortCircuitRoute = defineRoute({
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
  handler: ({ body }) => {
    try {
      return shortCircuit(body.model);
    } catch (e) {
      throw e instanceof InvalidModelError ? modelIssuesError(e.issues, 'model.') : e;
    }
  },
});
