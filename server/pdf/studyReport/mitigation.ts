/**
 * Appendix: mitigation options for the buses above a chosen incident energy (GET /studies/:id/report.pdf
 * ?mitigationAboveCalPerCm2=…). Per bus, the present hazard and the best options toward that energy as the target —
 * before → after energy, PPE level, signal word, arc duration and clearing device, whether it reaches the target, the
 * selectivity verdict with each check's margin — then the kinds that gave no option, and the cautions of the options
 * (model results, to be reviewed and sealed by a qualified engineer). The options are those of the app's mitigation
 * view (server/engine/mitigation), computed on this revision's model.
 */
import type { MitigationHazard, MitigationOption, MitigationResponse } from '../../../shared/schemas/mitigation';
import type { StudyDto } from '../../../shared/schemas/studies';
import { formatCalPerCm2, formatSeconds } from '../format';
import type { ReportWriter } from './writer';

/** Options printed per bus, best first (the rest are counted). */
export const APPENDIX_OPTIONS_PER_BUS = 3;

/** One bus above the energy: its options, or why there are none. */
export type MitigationAppendixBus =
  | { busId: string; busName: string; energyCalPerCm2: number; response: MitigationResponse }
  | { busId: string; busName: string; energyCalPerCm2: number; error: string };

export interface MitigationAppendix {
  /** Buses above this energy are listed, and it is the options' target, cal/cm². */
  aboveCalPerCm2: number;
  /** Highest energy first. */
  buses: MitigationAppendixBus[];
  /** Buses above the energy whose options were not computed for the report (beyond the report's limit). */
  notComputed: { busId: string; energyCalPerCm2: number }[];
}

export const MITIGATION_APPENDIX_HEADING = 'Appendix A. Mitigation options';

const energy = (cal: number) => `${formatCalPerCm2(cal)} cal/cm²`;
/** The organization's PPE level name as it is (e.g. "PPE level 2"), or that none is adequate. */
const ppe = (h: MitigationHazard) => h.ppeLevel ?? 'no PPE level adequate';
const margin = (s: number | null) => (s === null ? 'no margin' : `${s >= 0 ? '+' : '−'}${formatSeconds(Math.abs(s))}`);

function clearing(h: MitigationHazard): string {
  if (!h.clearingDeviceId) return 'no device clears (capped)';
  return `${h.clearingDeviceId}, ${formatSeconds(h.arcDurationS)}${h.arcDurationCapped ? ' (capped)' : ''}`;
}

/** The selectivity verdict sentence with each check's margin after (and before) the change. */
export function selectivityText(o: MitigationOption): string {
  const checks = o.selectivity.checks.map(
    (c) =>
      `${c.upstreamDeviceId} over ${c.downstreamDeviceId} (fault at ${c.faultBusId}): ${c.selective ? 'selective' : 'overlap'}, margin ${margin(c.marginS)} (before ${margin(c.marginBeforeS)})`,
  );
  return [o.selectivity.sentence, ...checks].join(' ');
}

export function renderMitigationAppendix(
  w: ReportWriter,
  appendix: MitigationAppendix | undefined,
  study: Pick<StudyDto, 'resultsCurrent' | 'status'>,
): void {
  if (!appendix) return;
  const target = appendix.aboveCalPerCm2;
  w.newPage();
  w.heading(MITIGATION_APPENDIX_HEADING);
  w.paragraph(
    `Buses whose governing incident energy is above ${energy(target)}, highest first, with the options that bring ` +
      `each to or under ${energy(target)} (best first; at most ${APPENDIX_OPTIONS_PER_BUS} per bus). Each option was ` +
      'computed by running the study engine on this revision’s model with the change applied; its selectivity ' +
      'compares the changed device with the devices downstream of it on the path to the largest load (margin: ' +
      'upstream minimum time less downstream clearing time; positive is selective).',
  );
  w.paragraph(
    'These options are model results, not changes made: each must be reviewed, coordinated and sealed by a ' +
      'qualified (licensed) engineer before any setting or device is changed.',
    { font: w.fonts.textBold },
  );
  if (!study.resultsCurrent && (study.status === 'draft' || study.status === 'in-review'))
    w.paragraph(
      'The model has changed since the run these results come from: the options are computed on the current model, ' +
        'so the present energy they start from can differ from the results above. Run the study again.',
      { size: 8.5 },
    );
  if (!appendix.buses.length && !appendix.notComputed.length) {
    w.paragraph(`No bus is above ${energy(target)}.`);
    return;
  }
  const cautions = new Set<string>();
  for (const b of appendix.buses) {
    w.heading(`${b.busId} · ${b.busName}: ${energy(b.energyCalPerCm2)}`, 2);
    if ('error' in b) {
      w.paragraph(`No options: ${b.error}`);
      continue;
    }
    const r = b.response;
    r.cautions.forEach((c) => cautions.add(c));
    w.paragraph(
      `Now: ${energy(r.before.incidentEnergyCalPerCm2)}, ${r.before.signalWord}, ${ppe(r.before)}, cleared by ` +
        `${clearing(r.before)}.`,
      { size: 8.5 },
    );
    const shown = r.options.slice(0, APPENDIX_OPTIONS_PER_BUS);
    if (!shown.length) w.paragraph('No option found.', { size: 8.5 });
    shown.forEach((o, i) => {
      const reach = o.reachesTarget
        ? 'reaches the target'
        : `comes within ${energy(Math.max(0, o.result.incidentEnergyCalPerCm2 - target))} of the target`;
      w.paragraph(`Option ${i + 1}: ${o.title}`, { font: w.fonts.textBold, size: 9, after: 1 });
      w.paragraph(
        `Energy ${formatCalPerCm2(r.before.incidentEnergyCalPerCm2)} → ${energy(o.result.incidentEnergyCalPerCm2)} ` +
          `(${reach}); ${ppe(r.before)} → ${ppe(o.result)}; signal word ${r.before.signalWord} → ` +
          `${o.result.signalWord}; cleared by ${clearing(o.result)}.`,
        { size: 8.5, indent: 10, after: 1 },
      );
      w.paragraph(selectivityText(o), { size: 8.5, indent: 10, after: 1 });
      if (o.otherBuses.length)
        w.paragraph(
          `Other buses: ${o.otherBuses
            .map(
              (b) =>
                `${b.busId} ${b.beforeCalPerCm2 === null ? '—' : formatCalPerCm2(b.beforeCalPerCm2)} → ${b.afterCalPerCm2 === null ? '—' : energy(b.afterCalPerCm2)}`,
            )
            .join(', ')}.`,
          { size: 8.5, indent: 10, after: 1 },
        );
      if (o.notes.length) w.paragraph(`Notes: ${o.notes.join(' ')}`, { size: 8, indent: 10 });
    });
    if (r.options.length > shown.length)
      w.paragraph(`${r.options.length - shown.length} more option(s) in the app's mitigation view.`, { size: 8 });
    if (r.skipped.length)
      w.bullets(
        r.skipped.map((s) => `Not proposed, ${s.kind}: ${s.reason}`),
        7.5,
      );
  }
  if (appendix.notComputed.length) {
    w.heading('Also above the energy, options not computed for this report', 2);
    w.paragraph(
      `${appendix.notComputed.map((b) => `${b.busId} (${energy(b.energyCalPerCm2)})`).join(', ')}: open each bus's ` +
        'clearing trace in the app and choose "Bring this down".',
      { size: 8.5 },
    );
  }
  if (cautions.size) {
    w.heading('Cautions of the options', 2);
    w.bullets([...cautions]);
  }
}
