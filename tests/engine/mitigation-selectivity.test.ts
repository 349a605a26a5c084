/**
 * The selectivity check of the mitigation search (server/engine/mitigation/selectivity.ts) on the hand-worked radial
 * case (tests/fixtures/mitigationRadial.ts): lowering the transformer-primary relay's instantaneous pickup makes it
 * overlap the secondary main. The band times are worked by hand here:
 * - bolted fault current at the secondary: the per-unit method (IEEE 141 / IEEE 551 per-unit impedances: utility
 *   Z = S_base / S_sc, transformer Z = Z% × S_base / S_rated, each split by its X/R, summed as complex numbers);
 * - the relay's minimum (no-trip) time: IEEE C37.112-1996 very inverse, t = TD · (19.61 / (M² − 1) + 0.491), or its
 *   stated instantaneous operating time above the low edge of the pickup tolerance (± 10 %, the engine's stated
 *   default, common practice, no source);
 * - the main's clearing time: its stated band (short-time pickup 4 × Ir ± 10 %, flat delay 0.3 s, no time tolerance,
 *   plus 0.05 s breaker clearing);
 * - the arcing currents come from the project's IEEE 1584-2018 functions (`computeArcingCurrents`), which
 *   tests/engine/ieee1584.test.ts checks against the standard's Annex D.1 and a published 480 V check (whose
 *   configuration — VCB, 25 mm, 508 mm box — is the secondary bus's here).
 */
import { applyModelPatch } from '../../shared/modelPatch';
import type { ModelPatchOp } from '../../shared/schemas/mitigation';
import { modelSchema, type Model, type PlacedDevice } from '../../shared/schemas/model';
import { computeArcingCurrents } from '../../server/engine/ieee1584/compute';
import { checkSelectivity, downstreamOnLargestLoadPath } from '../../server/engine/mitigation/selectivity';
import { RADIAL, mitigationRadial } from '../fixtures/mitigationRadial';
import { expectClose } from '../helpers/approx';

const model: Model = modelSchema.parse(mitigationRadial());
const relay = model.devices.find((d) => d.id === 'R-TX') as PlacedDevice;

/** The relay with another instantaneous pickup (primary amperes). */
function relayInst(instantaneousA: number): ModelPatchOp[] {
  return [{ op: 'replace-device', deviceId: 'R-TX', device: { ...relay.device, instantaneousA } as never }];
}

// ---- Hand work: bolted fault at SEC by the per-unit method (S_base = 1.5 MVA, V_base = 0.48 kV) ----
const sBaseMva = RADIAL.kva / 1000;
const zUtility = sBaseMva / RADIAL.utilityMva; // 0.006 pu
const rU = zUtility / Math.sqrt(1 + RADIAL.utilityXr ** 2);
const xU = rU * RADIAL.utilityXr;
const zTx = RADIAL.impedancePct / 100; // on its own rating = the base
const rT = zTx / Math.sqrt(1 + RADIAL.txXr ** 2);
const xT = rT * RADIAL.txXr;
const zPu = Math.hypot(rU + rT, xU + xT); // 0.06349 pu
const iBaseA = (sBaseMva * 1e6) / (Math.sqrt(3) * RADIAL.secondaryKv * 1000); // 1804.2 A
const ibfA = iBaseA / zPu; // ≈ 28 418 A
const turns = RADIAL.secondaryKv / RADIAL.utilityKv;
const relayBoltedA = ibfA * turns; // ≈ 988 A at 13.8 kV

// IEEE C37.112-1996, very inverse: A = 19.61, B = 0.491, p = 2 (relay time, no breaker).
const veryInverseS = (currentA: number) =>
  RADIAL.relay.timeDial * (19.61 / ((currentA / RADIAL.relay.pickupA) ** 2 - 1) + 0.491);
// The main's stated band above 1.1 × 4 × 2000 A = 8800 A: flat short-time 0.3 s + 0.05 s clearing.
const mainClearingS = RADIAL.main.shortTimeDelayS + RADIAL.main.clearingS;
// IEEE 1584-2018 arcing currents at SEC (project functions, checked in ieee1584.test.ts).
const arcing = computeArcingCurrents({ voltageV: 480, boltedFaultKa: ibfA / 1000, electrodeConfig: 'VCB', gapMm: 25 });
const iarcFullA = arcing.arcingCurrentKa.full * 1000;
const iarcReducedA = arcing.arcingCurrentKa.reduced * 1000;

describe('hand-worked radial: the primary relay instantaneous lowered to 500 A', () => {
  const patched = applyModelPatch(model, relayInst(500));
  const s = checkSelectivity({ model, patched, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'check' });

  it('the hand-worked currents lie where the comparison below assumes (sanity of the hand work)', () => {
    expectClose(ibfA, 28418, 1e-3); // per-unit method, worked above
    // Every current the relay sees is above the 500 A setting's high edge (550 A) and below the 3000 A one's
    // low edge (2700 A); every current the main sees is above its short-time high edge 8800 A.
    for (const a of [relayBoltedA, iarcFullA * turns, iarcReducedA * turns]) {
      expect(a).toBeGreaterThan(550);
      expect(a).toBeLessThan(2700);
    }
    expect(iarcReducedA).toBeGreaterThan(8800);
  });

  it('compares the secondary main first (fault at SEC) and reports the overlap it did not have before', () => {
    expect(s.verdict).toBe('lost');
    const main = s.checks[0];
    expect(main.downstreamDeviceId).toBe('CB-MAIN');
    expect(main.faultBusId).toBe('SEC');
    expect(main.selective).toBe(false);
    expect(main.selectiveBefore).toBe(true);
    const bolted = main.points.find((p) => p.current === 'bolted')!;
    expectClose(bolted.downstreamA, ibfA, 1e-6); // per-unit method
    expectClose(bolted.upstreamA, relayBoltedA, 1e-6); // per-unit method × turns ratio
    expectClose(bolted.upstreamMinimumS!, RADIAL.relay.instantaneousDelayS, 1e-9); // relay's stated inst. time
    expectClose(bolted.downstreamClearingS!, mainClearingS, 1e-9); // main's stated band
    expectClose(bolted.marginS!, 0.02 - 0.35, 1e-9);
    expect(bolted.selective).toBe(false);
    // Arcs at SEC: each device sees its bolted current × I_arc / I_bf (IEEE 1584-2018 currents).
    const full = main.points.find((p) => p.current === 'arcing-full')!;
    const reduced = main.points.find((p) => p.current === 'arcing-reduced')!;
    expectClose(full.downstreamA, iarcFullA, 1e-6);
    expectClose(full.upstreamA, iarcFullA * turns, 1e-6);
    expectClose(reduced.upstreamA, iarcReducedA * turns, 1e-6);
    for (const p of [full, reduced]) {
      expectClose(p.upstreamMinimumS!, 0.02, 1e-9);
      expectClose(p.downstreamClearingS!, 0.35, 1e-9);
    }
    expectClose(main.marginS!, -0.33, 1e-9);
    // Before: the inverse-time element at the bolted current gives the smallest margin (lower currents, longer times).
    expectClose(main.marginBeforeS!, veryInverseS(relayBoltedA) - mainClearingS, 1e-9); // IEEE C37.112 VI
    expectClose(veryInverseS(relayBoltedA), 0.6938, 1e-3); // 19.61 / (9.884² − 1) + 0.491
    expect(s.sentence).toContain('Secondary main');
    expect(s.sentence).toMatch(/overlap 0\.33 s/);
  });

  it('then the panel feeder (fault at PNL), nearest first', () => {
    expect(s.checks.map((c) => c.downstreamDeviceId)).toEqual(['CB-MAIN', 'CB-FDR']);
    const fdr = s.checks[1];
    expect(fdr.faultBusId).toBe('PNL');
    // The relay now starts at 0.02 s, before the feeder's 1.5-cycle (0.025 s) instantaneous clearing: overlap;
    // before, its inverse-time element (≈ 0.7 s) waited.
    expect(fdr.selectiveBefore).toBe(true);
    expect(fdr.selective).toBe(false);
    const bolted = fdr.points.find((p) => p.current === 'bolted')!;
    expectClose(bolted.downstreamClearingS!, 1.5 / 60, 1e-9); // IEEE 1584-2002 Table 1: 1.5 cycles
    expectClose(bolted.upstreamMinimumS!, 0.02, 1e-9);
    // One current through both (radial): the relay sees the feeder's current × turns ratio.
    expectClose(bolted.upstreamA, bolted.downstreamA * turns, 1e-6);
  });
});

describe('verdicts', () => {
  it('the model as it is: kept, with the inverse-time margin', () => {
    const s = checkSelectivity({ model, patched: model, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'check' });
    expect(s.verdict).toBe('kept');
    expect(s.checks.every((c) => c.selective && c.selectiveBefore)).toBe(true);
    expectClose(s.checks[0].marginS!, veryInverseS(relayBoltedA) - mainClearingS, 1e-9); // IEEE C37.112 VI
  });

  it('an overlap that was already there: already-lost', () => {
    const base = applyModelPatch(model, relayInst(500));
    const patched = applyModelPatch(base, relayInst(400));
    const s = checkSelectivity({ model: base, patched, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'check' });
    expect(s.verdict).toBe('already-lost');
    expect(s.checks[0].selectiveBefore).toBe(false);
  });

  it('a maintenance-switch element beside the relay: compared while on, verdict while-on', () => {
    const element: PlacedDevice = {
      id: 'R-TX-MAINT',
      name: 'R-TX maintenance setting',
      branch: 'TX',
      end: 'from',
      device: { ...relay.device, instantaneousA: 500 } as PlacedDevice['device'],
      onlyAt: { busIds: ['SEC'], purpose: 'maintenance-switch' },
    };
    const patched = applyModelPatch(model, [{ op: 'add-device', placed: element }]);
    const s = checkSelectivity({ model, patched, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'while-on' });
    expect(s.verdict).toBe('while-on');
    expect(s.checks[0].downstreamDeviceId).toBe('CB-MAIN');
    expectClose(s.checks[0].marginS!, 0.02 - 0.35, 1e-9); // the element's stated 0.02 s against the main's 0.35 s
    expect(s.checks[0].selectiveBefore).toBe(true);
    expect(s.sentence).toMatch(/While the maintenance switch is on/);
    // Checked with mode 'check' the same element (acting only at SEC) is not part of coordination: nothing changes.
    const asCheck = checkSelectivity({ model, patched, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'check' });
    expect(asCheck.verdict).toBe('kept');
  });

  it('not-affected gives no comparison; a device with nothing below it: no-downstream', () => {
    const na = checkSelectivity({
      model,
      patched: model,
      deviceId: 'R-TX',
      busId: 'SEC',
      options: {},
      mode: 'not-affected',
    });
    expect(na.verdict).toBe('not-affected');
    expect(na.checks).toEqual([]);
    const leaf = checkSelectivity({
      model,
      patched: model,
      deviceId: 'CB-FDR',
      busId: 'PNL',
      options: {},
      mode: 'check',
    });
    expect(leaf.verdict).toBe('no-downstream');
  });
});

describe('a device added beside the changed one (a fuse with the primary relay)', () => {
  // A fuse at the relay's place whose minimum-melting curve is a straight line on log-log axes through
  // (100 A, 10 s) and (10 000 A, 0.001 s): t = 10 · (I / 100)⁻² (the engine reads between points log-log).
  const fuse: PlacedDevice = {
    id: 'FU-TX',
    name: 'Primary fuse',
    branch: 'TX',
    end: 'from',
    device: {
      kind: 'fuse',
      ratingA: 80,
      minimumMelt: [
        [100, 10],
        [10000, 0.001],
      ],
      totalClearing: [
        [100, 20],
        [10000, 0.002],
      ],
    },
  };
  const patched = applyModelPatch(model, [{ op: 'add-device', placed: fuse }]);
  const s = checkSelectivity({ model, patched, deviceId: 'R-TX', busId: 'SEC', options: {}, mode: 'check' });

  it('the first of the two to operate counts: the fuse melts before the relay would start, and overlaps the main', () => {
    const main = s.checks.find((c) => c.downstreamDeviceId === 'CB-MAIN')!;
    const bolted = main.points.find((p) => p.current === 'bolted')!;
    const fuseMeltS = 10 * (relayBoltedA / 100) ** -2; // ≈ 0.102 s, below the relay's 0.694 s (IEEE C37.112 VI)
    expect(fuseMeltS).toBeLessThan(veryInverseS(relayBoltedA));
    expectClose(bolted.upstreamMinimumS!, fuseMeltS, 1e-9);
    expectClose(bolted.marginS!, fuseMeltS - mainClearingS, 1e-9);
    expect(main.selectiveBefore).toBe(true); // before: the relay alone, margin 0.344 s
    expectClose(main.marginBeforeS!, veryInverseS(relayBoltedA) - mainClearingS, 1e-9);
    expect(s.verdict).toBe('lost');
  });
});

describe('the path to the largest load', () => {
  it('follows the branch with the larger load below it (transformer kVA, motors)', () => {
    const input = mitigationRadial();
    // A second feeder from SEC to a bus with a 300 kVA transformer below it: the larger load is there.
    input.buses.push(
      { id: 'B2', name: 'Second panel', nominalKv: 0.48 },
      { id: 'B3', name: 'Lighting', nominalKv: 0.208 },
    );
    input.cables!.push({ id: 'F2', fromBus: 'SEC', toBus: 'B2', lengthM: 10, rOhmPerKm: 0.1, xOhmPerKm: 0.1 });
    input.transformers!.push({
      id: 'T3',
      fromBus: 'B2',
      toBus: 'B3',
      kva: 300,
      primaryKv: 0.48,
      secondaryKv: 0.208,
      impedancePct: 4,
      xr: 3,
    });
    input.devices!.push({
      id: 'CB-F2',
      name: 'Second feeder',
      branch: 'F2',
      end: 'from',
      device: model.devices.find((d) => d.id === 'CB-FDR')!.device,
    } as never);
    const m = modelSchema.parse(input);
    const main = m.devices.find((d) => d.id === 'CB-MAIN')!;
    expect(downstreamOnLargestLoadPath(m, main).map((x) => [x.device.id, x.faultBusId])).toEqual([['CB-F2', 'B2']]);
    // Without the transformer the loads tie (0 kVA each): the first in model order (FDR) is followed.
    const m2 = modelSchema.parse({
      ...input,
      transformers: input.transformers!.slice(0, 1),
      buses: input.buses.slice(0, 4),
    });
    expect(downstreamOnLargestLoadPath(m2, main).map((x) => x.device.id)).toEqual(['CB-FDR']);
  });
});
