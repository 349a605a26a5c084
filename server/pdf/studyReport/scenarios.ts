/**
 * Section 4, results, continued: the operating scenarios evaluated (what each changes from the model as written) and,
 * per bus, the incident energy in each with the one the label takes marked. Drawn only for a model with scenarios.
 */
import { BASE_SCENARIO_ID, type Model, type Scenario } from '../../../shared/schemas/model';
import type { BusScenario, StudyResults } from '../../../shared/schemas/studyResults';
import { formatCalPerCm2 } from '../format';
import { num } from './texts';
import type { ReportWriter } from './writer';

/** Up to this many scenarios (base included) the energies are one column each; beyond, one row per bus and scenario. */
const WIDE_MAX = 5;

/** What a scenario changes from the model as written, in words ("UTIL out of service; TIE-1 closed"). */
export function scenarioChanges(s: Scenario | undefined): string {
  if (!s) return 'Nothing: the model as written';
  const parts: string[] = [];
  for (const [id, o] of Object.entries(s.sources ?? {})) {
    if (o.inService === false) {
      parts.push(`${id} out of service`);
      continue;
    }
    const bits: string[] = [];
    if (o.inService === true) bits.push('in service');
    if (o.shortCircuitMva !== undefined) bits.push(`${num(o.shortCircuitMva)} MVA short circuit`);
    if (o.shortCircuitKa !== undefined) bits.push(`${num(o.shortCircuitKa)} kA short circuit`);
    if (o.xr !== undefined) bits.push(`X/R ${num(o.xr)}`);
    if (bits.length) parts.push(`${id} ${bits.join(', ')}`);
  }
  for (const [id, o] of Object.entries(s.ties ?? {})) parts.push(`tie ${id} ${o.closed ? 'closed' : 'open'}`);
  if (s.allMotorsOff) parts.push('all motors stopped');
  for (const [id, o] of Object.entries(s.motors ?? {}))
    parts.push(`motor ${id} ${o.inService ? 'running' : 'stopped'}`);
  return parts.length ? parts.join('; ') : 'Nothing (same as the model as written)';
}

/** A scenario's energy at a bus as the table prints it; the governing one marked with an asterisk. */
function energyCell(s: BusScenario | undefined, governs: boolean): string {
  if (!s) return '—';
  if (s.status === 'de-energized') return 'de-energized';
  if (s.status === 'error') return governs ? 'error *' : 'error';
  const e = s.incidentEnergyCalPerCm2 === undefined ? '—' : formatCalPerCm2(s.incidentEnergyCalPerCm2);
  return governs ? `${e} *` : e;
}

export function renderScenarios(w: ReportWriter, results: StudyResults, model: Model): void {
  const list = results.scenarios;
  if (!list || list.length <= 1) return;
  w.heading('Operating scenarios', 2);
  w.paragraph(
    `The study evaluates every bus in ${list.length} operating states of the system: the model as written and ` +
      `${list.length - 1} scenario${list.length === 2 ? '' : 's'}, each changing only what it names. Each label ` +
      'takes the scenario with the highest incident energy at its bus (a lower fault current can mean a slower ' +
      'device and more energy); a scenario that fails at a bus governs it, and that bus gets no value. A bus that no ' +
      'source in service reaches in a scenario is skipped in it.',
  );
  const byId = new Map((model.scenarios ?? []).map((s) => [s.id, s]));
  w.table(
    [
      { header: 'Scenario', weight: 1.6 },
      { header: 'Id', weight: 0.9, mono: true },
      { header: 'What it changes', weight: 3.2 },
      { header: 'Buses it governs', weight: 0.8, align: 'right', mono: true },
    ],
    list.map((s) => [
      s.name,
      s.id,
      s.id === BASE_SCENARIO_ID ? 'Nothing: the model as written' : scenarioChanges(byId.get(s.id)),
      String(results.buses.filter((b) => (b.scenarioId ?? BASE_SCENARIO_ID) === s.id).length),
    ]),
    { size: 7.5 },
  );

  w.heading('Incident energy in each scenario, cal/cm²', 2);
  const note =
    '* the scenario the label takes (the highest incident energy, or the one that failed). Energies rounded up.';
  if (list.length <= WIDE_MAX) {
    w.table(
      [
        { header: 'Bus', weight: 0.9, mono: true },
        ...list.map((s) => ({ header: s.name, weight: 1, align: 'right' as const, mono: true })),
        { header: 'Label takes', weight: 1.2 },
      ],
      results.buses.map((b) => {
        const governing = b.scenarioId ?? BASE_SCENARIO_ID;
        return [
          b.busId,
          ...list.map((s) =>
            energyCell(
              b.scenarios?.find((x) => x.scenarioId === s.id),
              s.id === governing,
            ),
          ),
          list.find((s) => s.id === governing)?.name ?? governing,
        ];
      }),
      { size: 7, pad: 2.5, note },
    );
    return;
  }
  w.table(
    [
      { header: 'Bus', weight: 0.9, mono: true },
      { header: 'Scenario', weight: 2 },
      { header: 'Energy, cal/cm²', weight: 0.9, align: 'right', mono: true },
      { header: 'Clearing device', weight: 1.4, mono: true },
      { header: 'Arc duration, s', weight: 0.8, align: 'right', mono: true },
    ],
    results.buses.flatMap((b) =>
      (b.scenarios ?? []).map((s) => [
        b.busId,
        s.name,
        energyCell(s, s.scenarioId === (b.scenarioId ?? BASE_SCENARIO_ID)),
        s.status === 'ok' ? (s.clearingDeviceId ?? 'none before the cap') : (s.note ?? '—'),
        s.status === 'ok' ? num(s.arcDurationS) : '—',
      ]),
    ),
    { size: 7, pad: 2.5, note },
  );
}
