/**
 * Generated label contents for the label-truth property tests: energies across every range of the label's rules
 * (below 1.2 cal/cm², the PPE levels, above 40 cal/cm²) with the edges weighted in, boundaries across the inch
 * and centimetre edges, every table voltage row, one or several sources, both unit orders. Invented names only.
 */
import * as fc from 'fast-check';
import type { LabelContent } from '../../shared/schemas/labels';
import { DEFAULT_PPE_LEVELS } from '../../shared/schemas/organization';
import { gloveClass, shockApproachBoundaries, sitePpeLevel } from '../../server/engine/labelValues';

const EDGE_ENERGIES = [0.05, 0.99, 1.0, 1.19, 1.199, 1.2, 1.21, 3.99, 4.0, 4.01, 8.0, 24.99, 25.0, 39.99, 40.0, 40.01];
const J_PER_CAL = 4.184; // thermochemical calorie, exact by definition

const energyArb = fc.oneof(
  fc.constantFrom(...EDGE_ENERGIES),
  fc.double({ min: 0.02, max: 1.3, noNaN: true }),
  fc.double({ min: 1.3, max: 45, noNaN: true }),
  fc.double({ min: 45, max: 150, noNaN: true }),
);

const boundaryArb = fc.oneof(
  // inch edges: whole inches, and a hair either side of them
  fc
    .tuple(fc.integer({ min: 6, max: 1200 }), fc.constantFrom(-0.001, 0, 0.001))
    .map(([inches, d]) => inches * 25.4 + d),
  fc.double({ min: 100, max: 40_000, noNaN: true }),
);

const nameArb = fc.constantFrom(
  'Main switchboard',
  'Motor control centre 2 — influent pumps',
  'Panel LP-3, blower room',
  'Switchgear, 12.47 kV service',
  'Distribution panel DP-1',
);
const tagArb = fc.constantFrom('SWBD-1', 'MCC-2', 'LP-3', 'SWGR-A', 'DP-1', 'PNL-7B');
const deviceArb = fc.constantFrom(
  'CB-MAIN (Main breaker)',
  'F-12 (Feeder fuse)',
  'R-UTIL (Utility service relay)',
  'CB-GEN (Generator breaker)',
  'CB-TIE (Tie breaker)',
);

export const labelContentArb: fc.Arbitrary<LabelContent> = fc
  .record({
    energy: energyArb,
    boundaryMm: boundaryArb,
    workingDistanceMm: fc.constantFrom(457.2, 609.6, 914.4),
    voltage: fc.constantFrom(208, 480, 600, 4160, 12470, 13800),
    tag: tagArb,
    name: nameArb,
    clearing: fc.option(deviceArb, { nil: null }),
    others: fc.array(deviceArb, { maxLength: 2 }),
    cap: fc.constantFrom(2, 1.5, 2),
    unitOrder: fc.constantFrom<'us-first' | 'si-first' | undefined>('us-first', 'si-first', undefined),
    revision: fc.integer({ min: 1, max: 12 }),
    reduced: fc.boolean(),
  })
  .map((g): LabelContent => {
    const level = sitePpeLevel(g.energy, DEFAULT_PPE_LEVELS);
    const noPpe = g.energy > 40;
    const shock = shockApproachBoundaries(g.voltage);
    const glove = gloveClass(g.voltage);
    return {
      signalWord: noPpe ? 'DANGER' : 'WARNING',
      equipmentTag: g.tag,
      equipmentName: g.name,
      siteName: 'Larkspur Valley Water Reclamation Facility',
      nominalVoltageV: g.voltage,
      incidentEnergyCalPerCm2: g.energy,
      incidentEnergyJPerCm2: g.energy * J_PER_CAL,
      workingDistanceMm: g.workingDistanceMm,
      arcFlashBoundaryMm: g.boundaryMm,
      minimumArcRatingCalPerCm2: Math.max(1, Math.ceil(g.energy)),
      ppeLevel: noPpe ? null : (level?.name ?? null),
      noAdequatePpe: noPpe || !level,
      limitedApproachMovable: shock?.limitedApproachMovable.text ?? null,
      limitedApproachFixed: shock?.limitedApproachFixed.text ?? null,
      restrictedApproach: shock?.restrictedApproach.text ?? null,
      gloveClass: glove ? `Class ${glove.class}` : null,
      clearingDevice: g.clearing,
      governingCase: g.reduced ? 'reduced arcing current' : 'full arcing current',
      studyTitle: 'Plant-wide incident energy study',
      studyRevision: g.revision,
      studyDate: '2026-03-14',
      reviewByDate: '2031-03-14',
      approvedBy: 'Dana Okafor, licence PE-40921 (Oregon)',
      caution:
        'Values from an engineering study (IEEE 1584-2018). De-energize where possible; follow the electrical safety program.',
      otherSourcesClearedBy: g.clearing ? g.others.filter((o) => o !== g.clearing) : [],
      arcDurationCapS: g.cap,
      ppeDescription: noPpe ? null : (level?.description ?? null),
      ...(g.unitOrder ? { unitOrder: g.unitOrder } : {}),
    };
  });

/** The same 1 000 contents every run (fixed seed), so a failure names a reproducible label. */
export function sampleLabelContents(n = 1000): LabelContent[] {
  return fc.sample(labelContentArb, { numRuns: n, seed: 1584 });
}
