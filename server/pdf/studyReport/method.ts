/** Section 2, method and assumptions: how the study was computed, and the study's warnings. */
import type { Model } from '../../../shared/schemas/model';
import type { StudyResults } from '../../../shared/schemas/studyResults';
import { formatSeconds, formatSig } from '../format';
import { num } from './texts';
import type { ReportWriter } from './writer';

export const METHOD_HEADING = 'Method and assumptions';

function methodItems(results: StudyResults, model: Model): string[] {
  const capS = results.maxArcDurationMs / 1000;
  const firstLv = results.buses.find((b) => b.labelValues)?.labelValues;
  const items = [
    `Short circuit: three-phase symmetrical rms bolted fault current at each bus from the complex impedances of the network (sources, transformers, cables, motors), pre-fault voltage ${num(model.prefaultPu ?? 1)} pu. The same solution gives the current through every branch, so each protective device is read at the current it sees.`,
    'Arcing current and incident energy: the IEEE 1584-2018 empirical model (208 V to 15 kV) with the electrode configuration, gap, working distance and enclosure size of each bus; values not entered are the typical values of the equipment class and are marked in the inputs.',
    'Both the full arcing current and the reduced arcing current (IEEE 1584-2018 arcing-current variation factor) are evaluated, each with its own clearing time; the case with the larger incident energy governs and is named in the results.',
    'Clearing time: read on the maximum (total clearing) curve of each device’s trip band at the current that device sees during the arc (its share of the arcing current, referred across transformers by the voltage ratio). Between published points the band is interpolated log-log; beyond its data it is not extrapolated and a warning is shown.',
    'Currents that change during the arc: each source’s contribution is followed in time — a generator’s by its decrement from the subtransient through the transient to the sustained current (X″d, X′d, Xd or a sustained-current multiple, T″d, T′d; typical values where not entered, marked in the warnings; without Xd or a sustained multiple both a low and a supported sustained current are evaluated and the higher energy kept), a source’s until a device opens every path from it. Each device operates when the integral of dt / t(I) over the current it sees reaches 1 (IEEE C37.112, the integral form of the inverse-time characteristic); a definite-time or instantaneous element when its current has stayed above its pickup for its delay; an element whose current falls below its pickup stops and starts over (the conservative reading).',
    'Energy added step by step (time-stepped energy): IEEE 1584-2018 energy is proportional to the arc duration at a constant arcing current, so the arc is divided into steps (one per stretch of constant current; fractions of the fastest time constant while a current decays) and the energy of each step, at the arcing current of its higher end, is added. Devices are read at the lower end of each step, the energy at the higher: the higher hazard either way.',
    results.motorDecayModel === 'higher'
      ? `Motor contribution: each case with induction motors feeding the arc is evaluated twice — with their full first-cycle contribution for ${formatSeconds(results.motorDecayS)}, then stopping, and with a contribution decaying as e^(−t/τ), τ = ${formatSeconds(results.motorDecayS)}, dropped after 5 τ (both common practice, no source) — and the higher energy is kept, since neither model always gives the higher; each bus's trace names the model that governed.`
      : results.motorDecayModel === 'exponential'
        ? `Motor contribution: induction motors feed the arc with a contribution decaying as e^(−t/τ), τ = ${formatSeconds(results.motorDecayS)}, dropped after 5 τ (common practice, no source).`
        : `Motor contribution: induction motors feed their full first-cycle contribution for ${formatSeconds(results.motorDecayS)}, then stop (common practice, no source).`,
    `Arc duration cap: ${formatSig(capS, 3)} s (${results.maxArcDurationMs} ms), after IEEE 1584 guidance that a worker can move away from the arc within 2 s; not valid where the worker cannot move away. Cases cut off at the cap are marked. A bus may carry its own cap, or none, with the engineer's reason (e.g. a confined space where escape is not possible); it is stated with the bus's trace.`,
    'Line side of the main: where a bus’s main device shares the enclosure without isolation, an arc on its line side is cleared by the next device upstream; both sides are evaluated and the worse governs the label. Where the isolation of the main is not stated it is taken as not isolated (the conservative choice) and listed among the defaulted values.',
    'Arc-flash boundary: the distance at which the incident energy falls to 5.0 J/cm² (1.2 cal/cm²).',
  ];
  if (firstLv) {
    items.push(firstLv.minimumArcRatingBasis, firstLv.ppeLevelBasis, firstLv.signalWordBasis);
    if (firstLv.shockApproach) items.push(`Shock approach boundaries: ${firstLv.shockApproach.source}`);
  }
  items.push(`Engine: ${results.method}.`);
  return items;
}

export function renderMethod(w: ReportWriter, results: StudyResults, model: Model): void {
  w.heading(`2. ${METHOD_HEADING}`);
  w.bullets(methodItems(results, model));
  if (results.warnings.length > 0) {
    w.heading('Study warnings', 2);
    w.bullets(
      results.warnings.map((x) => `${x.message} [${x.code}]`),
      8,
    );
  }
}
