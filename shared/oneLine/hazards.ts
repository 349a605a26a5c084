import type { StudyResults } from '../schemas/studyResults';
import type { BusHazard } from './geometry';

/**
 * Hazard by bus from a run's stored results, as the diagram shows it: the label's incident energy and signal word (the
 * bus's own energy where no label was made), and the governing scenario's name where the study has scenarios.
 */
export function hazardsFromResults(results: StudyResults): Map<string, BusHazard> {
  const names = new Map((results.scenarios ?? []).map((s) => [s.id, s.name]));
  const out = new Map<string, BusHazard>();
  for (const b of results.buses) {
    const e = b.labelValues?.incidentEnergyCalPerCm2 ?? b.incidentEnergyCalPerCm2;
    if (b.status !== 'ok' || e === undefined) continue;
    out.set(b.busId, {
      incidentEnergyCalPerCm2: e,
      signalWord: b.labelValues?.signalWord ?? null,
      scenario: b.scenarioId ? (names.get(b.scenarioId) ?? b.scenarioId) : null,
    });
  }
  return out;
}
