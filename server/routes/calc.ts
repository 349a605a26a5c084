import { bandCurves, clearingTime, resolveElectronicSettings } from '../engine/trip';
import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { computeIncidentEnergy } from '../engine/ieee1584';
import { InvalidModelError, shortCircuit } from '../engine/shortcircuit';
import { modelIssuesError } from '../services/errors';
import { computeLabelValues } from '../engine/labelValues';
import { getSettings, labelSettingsOf } from '../services/organization';

/** Stateless calculation routes: any signed-in role may call them. */
export const calcRoutes: AnyRoute[] = [
  bind(contract.calc.clearingTime, {
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
  bind(contract.calc.bandCurves, {
    handler: ({ body }) => bandCurves(body.device, { fromA: body.fromA, toA: body.toA }),
  }),
  bind(contract.calc.resolveTripUnit, {
    handler: ({ body }) => ({ device: resolveElectronicSettings(body.tripType, body.positions) }),
  }),
];

/** Incident energy plus the label values under the organization's settings. */
export const incidentEnergyRoute = bind(contract.calc.incidentEnergy, {
  handler: async ({ body, user }) => {
    const settings = await getSettings(user.organizationId);
    const result = computeIncidentEnergy({
      ...body,
      maxArcDurationMs: body.maxArcDurationMs ?? settings.maxArcDurationMs,
    });
    return { ...result, labelValues: computeLabelValues(result, body.voltageV, labelSettingsOf(settings)) };
  },
});

export const shortCircuitRoute = bind(contract.calc.shortCircuit, {
  handler: ({ body }) => {
    try {
      return shortCircuit(body.model);
    } catch (e) {
      throw e instanceof InvalidModelError ? modelIssuesError(e.issues, 'model.') : e;
    }
  },
});
