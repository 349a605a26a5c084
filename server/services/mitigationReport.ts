/**
 * The study report's mitigation appendix (GET /studies/:id/report.pdf?mitigationAboveCalPerCm2=…): the buses of the
 * results above the chosen energy, highest first, each with the options of the mitigation view toward that energy
 * (services/mitigation.ts: the same computation, its cache and its worker for large models).
 */
import { can } from '../../shared/permissions';
import type { StudyResults } from '../../shared/schemas/studyResults';
import type { MitigationAppendix } from '../pdf/studyReport';
import type { AuthUser } from './context';
import { ApiError } from './errors';
import { mitigationOptionsOfBuses } from './mitigation';

/**
 * Buses whose options a report computes, highest energy first (each is a search over candidate changes; the others
 * above the energy are named in the appendix). Common practice, no source: a report stays quick to make.
 */
export const REPORT_MITIGATION_MAX_BUSES = 12;

export async function mitigationAppendix(
  actor: AuthUser,
  studyId: string,
  results: StudyResults,
  aboveCalPerCm2: number,
): Promise<MitigationAppendix> {
  if (!can(actor.role, 'mitigate')) {
    const message = 'The mitigation appendix is for engineers: leave out mitigationAboveCalPerCm2';
    throw new ApiError('forbidden', message, { mitigationAboveCalPerCm2: message });
  }
  const above = results.buses
    .filter((b) => b.incidentEnergyCalPerCm2 !== undefined && b.incidentEnergyCalPerCm2 > aboveCalPerCm2)
    .sort((a, b) => (b.incidentEnergyCalPerCm2 as number) - (a.incidentEnergyCalPerCm2 as number));
  const computed = above.slice(0, REPORT_MITIGATION_MAX_BUSES);
  // One worker call for all of them (one core; the short-circuit solutions and the model's own results shared).
  const outcomes = await mitigationOptionsOfBuses(
    actor,
    studyId,
    computed.map((b) => b.busId),
    aboveCalPerCm2,
  );
  const buses: MitigationAppendix['buses'] = computed.map((b, k) => {
    const energyCalPerCm2 = b.incidentEnergyCalPerCm2 as number;
    const outcome = outcomes[k];
    if ('response' in outcome)
      return { busId: b.busId, busName: b.busName, energyCalPerCm2, response: outcome.response };
    // A bus the search cannot take (e.g. a model problem) is named with the reason; anything else fails the report.
    const e = outcome.error;
    if (e.code !== 'bad_request' && e.code !== 'unprocessable') throw e;
    return { busId: b.busId, busName: b.busName, energyCalPerCm2, error: e.message };
  });
  return {
    aboveCalPerCm2,
    buses,
    notComputed: above
      .slice(REPORT_MITIGATION_MAX_BUSES)
      .map((b) => ({ busId: b.busId, energyCalPerCm2: b.incidentEnergyCalPerCm2 as number })),
  };
}
