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
import { mitigationOptions } from './mitigation';

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
  const buses: MitigationAppendix['buses'] = [];
  // One bus after another: each search may use the study worker, and a report must not take every core.
  for (const b of above.slice(0, REPORT_MITIGATION_MAX_BUSES)) {
    const energyCalPerCm2 = b.incidentEnergyCalPerCm2 as number;
    try {
      const response = await mitigationOptions(actor, studyId, { busId: b.busId, targetCalPerCm2: aboveCalPerCm2 });
      buses.push({ busId: b.busId, busName: b.busName, energyCalPerCm2, response });
    } catch (e) {
      // A bus the search cannot take (e.g. a model problem) is named with the reason; anything else fails the report.
      if (!(e instanceof ApiError) || (e.code !== 'bad_request' && e.code !== 'unprocessable')) throw e;
      buses.push({ busId: b.busId, busName: b.busName, energyCalPerCm2, error: e.message });
    }
  }
  return {
    aboveCalPerCm2,
    buses,
    notComputed: above
      .slice(REPORT_MITIGATION_MAX_BUSES)
      .map((b) => ({ busId: b.busId, energyCalPerCm2: b.incidentEnergyCalPerCm2 as number })),
  };
}
