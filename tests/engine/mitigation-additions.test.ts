/**
 * The options that add a device or isolate the main (server/engine/mitigation/additions.ts), on the small invented
 * plant (tests/fixtures/smallModel.ts: 12.47 kV utility → relay R-TX → 1500 kVA transformer → SWBD main CB-MAIN →
 * MCC feeder CB-MCC → panel fuse). Sources of the numbers: the relay's supervision rule (50 % of the lowest arcing
 * current, not below 1.25 × the continuous rating) is common practice, no source; its 2.5 ms operating time is from
 * memory; the breaker time is the model's own (R-TX: 5 cycles at 60 Hz); the fuse ratings are the generic library's.
 */
import { applyModelPatch } from '../../shared/modelPatch';
import { parseModel, type Model } from '../../shared/schemas/model';
import { mitigate } from '../../server/engine/mitigation';
import {
  ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE,
  ARC_FLASH_RELAY_OPERATING_S,
  ARC_FLASH_RELAY_SUPERVISION_SHARE,
} from '../../server/engine/mitigation/additions';
import { createScenarioRunner } from '../../server/engine/study';
import { genericLvFuse } from '../../server/engine/trip/genericLibrary';
import { smallModel } from '../fixtures/smallModel';

const parsed = parseModel(smallModel());
if (!parsed.success) throw new Error('small model invalid');
const model: Model = parsed.model;
const base = createScenarioRunner(model, {});

describe('arc-flash relay', () => {
  const swbd = mitigate(model, 'SWBD', 8, {});
  const relay = swbd.options.find((o) => o.kind === 'arc-flash-relay')!;

  it('is placed at the clearing relay’s branch end, acting only at the bus, set by the stated rule', () => {
    // The line side governs at SWBD and is cleared by the transformer primary relay R-TX (its own 5-cycle breaker).
    expect(swbd.before.governing.location).toBe('line-side');
    expect(swbd.before.clearingDeviceId).toBe('R-TX');
    const op = relay.modelPatch[0];
    if (op.op !== 'add-device') throw new Error('expected an added device');
    expect(op.placed).toMatchObject({
      branch: 'TX',
      end: 'from',
      onlyAt: { busIds: ['SWBD'], purpose: 'arc-flash-relay' },
    });
    const d = op.placed.device;
    if (d.kind !== 'relay') throw new Error('expected a relay');
    expect(d.instantaneousDelayS).toBe(ARC_FLASH_RELAY_OPERATING_S);
    expect(d.breakerCycles).toBe(5);
    // The lowest current R-TX sees for an arc at SWBD (the engine's own readings of the base model).
    const lowest = Math.min(
      ...base
        .runBus('SWBD')
        .cases.flatMap((c) => c.devices.filter((x) => x.deviceId === 'R-TX').map((x) => x.currentA)),
    );
    const expected = Math.max(ARC_FLASH_RELAY_SUPERVISION_SHARE * lowest, ARC_FLASH_RELAY_MIN_LOAD_MULTIPLE * 100);
    expect(d.instantaneousA).toBe(Number(expected.toPrecision(3)));
    expect(relay.selectivity.verdict).toBe('not-affected');
  });

  it('cuts the utility off after the relay time plus the breaker’s 5 cycles, worked by hand', () => {
    // 0.0025 s (from memory) + 5 / 60 s (the model's breaker) = 0.085833 s. The pump motor keeps feeding the arc
    // until its decay ends (the engine's motor model), so the arc lasts longer than that; the utility's part stops.
    const relayId = relay.modelPatch[0].op === 'add-device' ? relay.modelPatch[0].placed.id : '';
    const run = createScenarioRunner(applyModelPatch(model, relay.modelPatch), {}).runBus('SWBD');
    const g = run.cases.find((c) => c.arcCase === run.governing?.arcCase && c.location === run.governing?.location)!;
    const util = g.sources.find((x) => x.sourceId === 'UTIL')!;
    expect(util.cutByDeviceId).toBe(relayId);
    expect(util.stopsAtS).toBeCloseTo(0.0025 + 5 / 60, 9);
    expect(relay.result.incidentEnergyCalPerCm2).toBe(run.incidentEnergyCalPerCm2);
    expect(relay.reachesTarget).toBe(true);
    // No other bus changes: the relay acts only for arcs at SWBD.
    expect(relay.otherBuses).toEqual([]);
  });

  it('is not proposed where the clearing device is a fuse', () => {
    const pnl = mitigate(model, 'PNL', 0.1, {});
    expect(pnl.skipped.find((s) => s.kind === 'arc-flash-relay')?.reason).toMatch(/fuse/);
  });
});

describe('current-limiting fuse', () => {
  it('is the smallest generic rating at or above the breaker’s, beside it, credited by total clearing only', () => {
    const mcc = mitigate(model, 'MCC', 0.8, {});
    const fuse = mcc.options.find((o) => o.kind === 'current-limiting-fuse')!;
    const op = fuse.modelPatch[0];
    if (op.op !== 'add-device') throw new Error('expected an added device');
    // CB-MCC is a 400 A breaker on the MCC feeder; the generic LV fuses include 400 A.
    expect(op.placed).toMatchObject({ branch: 'F-MCC', end: 'from' });
    expect(op.placed.device).toEqual({ ...genericLvFuse(400), name: 'Generic 400 A current-limiting fuse' });
    expect(op.placed.onlyAt).toBeUndefined();
    expect(fuse.deviceId).toBe('CB-MCC');
    expect(fuse.result.incidentEnergyCalPerCm2).toBeLessThan(mcc.before.incidentEnergyCalPerCm2);
  });

  it('is not proposed above 1 kV', () => {
    const swbd = mitigate(model, 'SWBD', 8, {});
    expect(swbd.skipped.find((s) => s.kind === 'current-limiting-fuse')?.reason).toMatch(/kV/);
  });
});

describe('line-side isolation', () => {
  it('is proposed where the line side governs, and gives the load side’s energy', () => {
    const swbd = mitigate(model, 'SWBD', 8, {});
    const iso = swbd.options.find((o) => o.kind === 'line-side-isolation')!;
    expect(iso.modelPatch).toEqual([{ op: 'set-main-isolated', busId: 'SWBD' }]);
    expect(iso.result.governing.location).toBe('load-side');
    // With the main isolated only the load-side cases remain: the higher of the base run's two load-side cases.
    const loadSide = base
      .runBus('SWBD')
      .cases.filter((c) => c.location === 'load-side')
      .map((c) => c.incidentEnergyCalPerCm2);
    expect(iso.result.incidentEnergyCalPerCm2).toBe(Math.max(...loadSide));
  });

  it('is not proposed where the load side governs', () => {
    const mcc = mitigate(model, 'MCC', 0.8, {});
    expect(mcc.skipped.map((s) => s.kind)).toContain('line-side-isolation');
  });
});
