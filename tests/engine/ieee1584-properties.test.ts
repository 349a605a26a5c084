import * as fc from 'fast-check';
import { expectClose, isClose } from '../helpers/approx';
import {
  computeArcingCurrents,
  computeCaseEnergy,
  computeIncidentEnergy,
  type IncidentEnergyInput,
} from '../../server/engine/ieee1584';
import { ELECTRODE_CONFIGS } from '../../server/engine/equipmentClasses';

// Properties of the IEEE 1584-2018 empirical model (Eqs. 1-25) over its range of model (208 V-15 kV; bolted current
// 0.5-106 kA up to 600 V, 0.2-65 kA above; gap 6.35-76.2 mm up to 600 V, 19.05-254 mm above; working distance
// ≥ 305 mm; enclosure height and width up to 1244.6 mm).

const config = fc.constantFrom(...ELECTRODE_CONFIGS);
const num = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const enclosure = fc.record({ height: num(508, 1244.6), width: num(508, 1244.6), depth: num(203.3, 1000) });

/** Inputs inside the model's range (enclosure width > 4 × gap, as the model requires). */
const lowVoltage = fc.record({
  voltageV: num(208, 600),
  boltedFaultKa: num(0.5, 106),
  electrodeConfig: config,
  gapMm: num(6.35, 76.2),
  workingDistanceMm: num(305, 3000),
  enclosureMm: enclosure,
});
const mediumVoltage = fc.record({
  voltageV: num(600.001, 15000),
  boltedFaultKa: num(0.2, 65),
  electrodeConfig: config,
  gapMm: num(19.05, 254),
  workingDistanceMm: num(305, 3000),
  enclosureMm: enclosure,
});
const anyVoltage = fc.oneof(lowVoltage, mediumVoltage);

/**
 * Where the bolted current is raised: the published model's arcing current and energy are not monotone in Ibf at
 * 208-240 V above about 57 kA (VOA, VCBB, HCB with small gaps; found by a sweep of Eqs. 1, 6, 25 with these tables).
 * That corner is left out of the monotonicity property and reported; everywhere else the property must hold.
 */
const monotoneInCurrent = anyVoltage.filter((p) => !(p.voltageV < 250 && p.boltedFaultKa > 50));

function withDuration(
  p: Omit<IncidentEnergyInput, 'arcDurationMs' | 'clearingMs'>,
  durationMs: number,
): IncidentEnergyInput {
  return { ...p, arcDurationMs: durationMs, maxArcDurationMs: 1e6 };
}

describe('IEEE 1584-2018 model properties', () => {
  it('incident energy is proportional to arc duration (Eqs. 3-6: E = 12.552/50 · T · 10^(…))', () => {
    fc.assert(
      fc.property(anyVoltage, num(10, 2000), num(1.01, 5), (p, t, k) => {
        const a = computeIncidentEnergy(withDuration(p, t));
        const b = computeIncidentEnergy(withDuration(p, t * k));
        expect(b.cases.full.incidentEnergyJPerCm2).toBeGreaterThan(a.cases.full.incidentEnergyJPerCm2);
        expect(b.cases.reduced.incidentEnergyJPerCm2).toBeGreaterThan(a.cases.reduced.incidentEnergyJPerCm2);
        expectClose(b.cases.full.incidentEnergyJPerCm2, k * a.cases.full.incidentEnergyJPerCm2, 1e-9);
        expect(b.arcFlashBoundaryMm).toBeGreaterThan(a.arcFlashBoundaryMm);
      }),
    );
  });

  it('incident energy and arcing current rise with bolted fault current (Eqs. 1, 3-6, 16-25)', () => {
    fc.assert(
      fc.property(monotoneInCurrent, num(1.01, 1.5), (p, k) => {
        const boltedHigh = p.boltedFaultKa * k;
        const limit = p.voltageV <= 600 ? 106 : 65;
        fc.pre(boltedHigh <= limit && !(p.voltageV < 250 && boltedHigh > 50));
        const a = computeIncidentEnergy(withDuration(p, 100));
        const b = computeIncidentEnergy(withDuration({ ...p, boltedFaultKa: boltedHigh }, 100));
        expect(b.arcingCurrentKa.full).toBeGreaterThan(a.arcingCurrentKa.full);
        expect(b.arcingCurrentKa.reduced).toBeGreaterThan(a.arcingCurrentKa.reduced);
        expect(b.cases.full.incidentEnergyJPerCm2).toBeGreaterThan(a.cases.full.incidentEnergyJPerCm2);
        expect(b.cases.reduced.incidentEnergyJPerCm2).toBeGreaterThan(a.cases.reduced.incidentEnergyJPerCm2);
      }),
    );
  });

  it('incident energy falls with working distance (Eqs. 3-6: k12 < 0), the boundary does not move', () => {
    fc.assert(
      fc.property(anyVoltage, num(1.01, 3), (p, k) => {
        const a = computeIncidentEnergy(withDuration(p, 200));
        const b = computeIncidentEnergy(withDuration({ ...p, workingDistanceMm: p.workingDistanceMm * k }, 200));
        expect(b.cases.full.incidentEnergyJPerCm2).toBeLessThan(a.cases.full.incidentEnergyJPerCm2);
        expect(b.cases.reduced.incidentEnergyJPerCm2).toBeLessThan(a.cases.reduced.incidentEnergyJPerCm2);
        // per case (the governing case itself may change with distance above 600 V, where k12 differs by level)
        expectClose(b.cases.full.arcFlashBoundaryMm, a.cases.full.arcFlashBoundaryMm, 1e-12);
        expectClose(b.cases.reduced.arcFlashBoundaryMm, a.cases.reduced.arcFlashBoundaryMm, 1e-12);
      }),
    );
  });

  it('at the arc-flash boundary the energy is 5.0 J/cm² (≤ 600 V and at 2.7 and 14.3 kV: within 0.5 %)', () => {
    // IEEE 1584-2018 Eqs. (6)/(10) and (4)-(5)/(8)-(9): AFB is the distance at E = 5.0 J/cm². The printed 20 in
    // lg(20/T) stands for 5.0·50/12.552 = 19.92, so the energy there is 5.0208 J/cm² (0.42 % above 5.0).
    const atNodes = fc.oneof(
      lowVoltage,
      mediumVoltage.chain((p) => fc.constantFrom(2700, 14300).map((voltageV) => ({ ...p, voltageV }))),
    );
    fc.assert(
      fc.property(atNodes, num(10, 2000), (p, t) => {
        const r = computeIncidentEnergy(withDuration(p, t));
        const arcing = computeArcingCurrents(p);
        for (const arcCase of ['full', 'reduced'] as const) {
          const c = r.cases[arcCase];
          const e = computeCaseEnergy(
            arcing,
            arcCase,
            r.enclosureCorrectionFactor,
            c.arcDurationMs,
            c.arcFlashBoundaryMm,
          );
          expectClose(e.incidentEnergyJPerCm2, (12.552 / 50) * 20, 1e-9);
          expectClose(e.incidentEnergyJPerCm2, 5.0, 0.005);
        }
      }),
    );
  });

  it('between the model voltages E and AFB are interpolated separately (Eqs. 19-24): energy at the boundary within 10 % of 5.0 J/cm²', () => {
    // IEEE 1584-2018 Eqs. (19)-(24) interpolate E and AFB each on its own, so at 0.6-15 kV (other than 2.7 and
    // 14.3 kV) the energy at the interpolated boundary differs from 5.0 J/cm²; a sweep over the range of model gave
    // at most 7.8 % (HOA near 1 kV). This bounds that difference.
    fc.assert(
      fc.property(mediumVoltage, num(10, 2000), (p, t) => {
        const r = computeIncidentEnergy(withDuration(p, t));
        const arcing = computeArcingCurrents(p);
        const c = r.cases.full;
        const e = computeCaseEnergy(arcing, 'full', r.enclosureCorrectionFactor, c.arcDurationMs, c.arcFlashBoundaryMm);
        expectClose(e.incidentEnergyJPerCm2, 5.0, 0.1);
      }),
    );
  });

  it('the reduced arcing current is below the full one, with 0 < VarCf < 1 (Eq. 2)', () => {
    fc.assert(
      fc.property(anyVoltage, (p) => {
        const a = computeArcingCurrents(p);
        expect(a.varCf).toBeGreaterThan(0);
        expect(a.varCf).toBeLessThan(1);
        expect(a.arcingCurrentKa.reduced).toBeLessThan(a.arcingCurrentKa.full);
        expect(a.arcingCurrentKa.full).toBeLessThan(p.boltedFaultKa);
        expect(a.arcingCurrentKa.reduced).toBeGreaterThan(0);
      }),
    );
  });

  it('the governing case is the one with the larger energy, and the label values follow it', () => {
    fc.assert(
      fc.property(anyVoltage, num(10, 3000), num(10, 3000), (p, full, reduced) => {
        const r = computeIncidentEnergy({ ...p, clearingMs: { full, reduced } });
        const g = r.cases[r.governingCase];
        const other = r.cases[r.governingCase === 'full' ? 'reduced' : 'full'];
        expect(g.incidentEnergyJPerCm2).toBeGreaterThanOrEqual(other.incidentEnergyJPerCm2);
        expect(isClose(r.incidentEnergyJPerCm2, g.incidentEnergyJPerCm2, 1e-15)).toBe(true);
        expect(isClose(r.arcFlashBoundaryMm, g.arcFlashBoundaryMm, 1e-15)).toBe(true);
        expect(g.arcDurationMs).toBeLessThanOrEqual(2000); // default cap, IEEE 1584 2 s guidance
      }),
    );
  });

  it('is continuous where the method changes: at 600 V (Eq. 25 ↔ Eqs. 16-18) and at 2.7 kV (Eq. 18 ↔ Eq. 17)', () => {
    // IEEE 1584-2018: Eq. (25) gives Iarc_600 at 0.6 kV, and Eq. (16) passes through it; Eqs. (18) and (17) meet at 2.7 kV.
    // The reduced-case energy is checked for continuity at 2.7 kV only: at 600 V it jumps (by up to about 30 %) because,
    // by the interpretation used here, the k3 term of Eq. (6) keeps the unreduced Iarc_600 while above 600 V every
    // intermediate current is reduced. That interpretation awaits confirmation against the standard (reported).
    const geometry = fc.record({
      boltedFaultKa: num(0.5, 65),
      electrodeConfig: config,
      gapMm: num(19.05, 76.2),
      workingDistanceMm: num(305, 3000),
      enclosureMm: enclosure,
    });
    fc.assert(
      fc.property(geometry, fc.constantFrom(600, 2700), (p, v) => {
        const below = computeIncidentEnergy(withDuration({ ...p, voltageV: v }, 100));
        const above = computeIncidentEnergy(withDuration({ ...p, voltageV: v + 1e-6 }, 100));
        expectClose(above.arcingCurrentKa.full, below.arcingCurrentKa.full, 1e-6);
        expectClose(above.arcingCurrentKa.reduced, below.arcingCurrentKa.reduced, 1e-6);
        expectClose(above.cases.full.incidentEnergyJPerCm2, below.cases.full.incidentEnergyJPerCm2, 1e-6);
        expectClose(above.cases.full.arcFlashBoundaryMm, below.cases.full.arcFlashBoundaryMm, 1e-6);
        if (v === 2700) {
          expectClose(above.cases.reduced.incidentEnergyJPerCm2, below.cases.reduced.incidentEnergyJPerCm2, 1e-6);
        }
      }),
    );
  });
});
