/**
 * The study run, checked step by step against the engine functions it chains. Each of those functions is checked
 * against its published source in its own tests (IEEE 1584-2018 Annex D.1 and the 480 V check; IEEE C37.112 /
 * IEC 60255-151; NEC Chapter 9 Table 9 and the point-to-point example); here the chain itself is checked: the right
 * current reaches the right device, the right time reaches the energy equation, the worst case governs.
 */
import type { ModelInput } from '../../shared/schemas/model';
import { modelSchema } from '../../shared/schemas/model';
import {
  computeArcingCurrents,
  computeCaseEnergy,
  computeIncidentEnergy,
  resolveEnclosure,
} from '../../server/engine/ieee1584/compute';
import { createShortCircuitSolver, shortCircuit } from '../../server/engine/shortcircuit';
import { BOUNDARY_ENERGY_J_PER_CM2, createStudyRunner, runStudy } from '../../server/engine/study';
import { clearingTime } from '../../server/engine/trip';
import { expectClose } from '../helpers/approx';

const relayPrimary = {
  kind: 'relay',
  curve: 'IEEE-VI',
  pickupA: 100,
  timeDial: 1,
  instantaneousA: 3000,
  breakerCycles: 5,
} as const;
const mainElectronic = {
  kind: 'electronic',
  sensorA: 2000,
  longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
  shortTime: { pickup: 4, delayS: 0.3, i2t: false },
  pickupTolerancePct: 10,
  clearingS: 0.05,
} as const;
const feederTm = {
  kind: 'thermal-magnetic',
  ratingA: 400,
  thermal: {
    min: [
      [1.35, 300],
      [2, 30],
      [5, 3],
      [10, 0.8],
    ],
    max: [
      [1.35, 1500],
      [2, 100],
      [5, 12],
      [10, 4],
    ],
  },
  instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
  instantaneousClearingCycles: 1.5,
} as const;
const panelTm = { ...feederTm, ratingA: 100 };

/** Utility → 1500 kVA transformer → switchboard → cable → MCC → cable → panel; four devices. */
function radial(opts: { mainIsolated?: boolean } = {}): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      { id: 'SWGR', name: 'Service switchgear', nominalKv: 12.47 },
      {
        id: 'SWBD',
        name: 'Switchboard',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', mainIsolated: opts.mainIsolated ?? true },
      },
      { id: 'MCC', name: 'Motor control centre', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
      { id: 'PNL', name: 'Panel', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-shallow' } },
    ],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'SWGR', shortCircuitMva: 250, xr: 10 }],
    transformers: [
      {
        id: 'TX',
        fromBus: 'SWGR',
        toBus: 'SWBD',
        kva: 1500,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
    ],
    cables: [
      {
        id: 'F-MCC',
        fromBus: 'SWBD',
        toBus: 'MCC',
        lengthM: 30,
        sets: 2,
        size: '500',
        material: 'Cu',
        conduit: 'steel',
      },
      {
        id: 'F-PNL',
        fromBus: 'MCC',
        toBus: 'PNL',
        lengthM: 25,
        sets: 1,
        size: '1/0',
        material: 'Cu',
        conduit: 'steel',
      },
    ],
    devices: [
      { id: 'R-TX', name: 'Transformer primary relay', branch: 'TX', end: 'from', device: relayPrimary },
      { id: 'CB-MAIN', name: 'Switchboard main', branch: 'TX', end: 'to', device: mainElectronic },
      { id: 'CB-MCC', name: 'MCC feeder', branch: 'F-MCC', end: 'from', device: feederTm },
      { id: 'CB-PNL', name: 'Panel feeder', branch: 'F-PNL', end: 'from', device: panelTm },
    ],
  } as ModelInput;
}

const parse = (m: ModelInput) => modelSchema.parse(m);

describe('small radial study, step by step', () => {
  const model = parse(radial());
  const results = runStudy(model);
  const mcc = results.buses.find((b) => b.busId === 'MCC')!;

  it('labels the three buses with equipment, not the one without', () => {
    expect(results.buses.map((b) => b.busId)).toEqual(['SWBD', 'MCC', 'PNL']);
    expect(results.buses.every((b) => b.status === 'ok')).toBe(true);
  });

  it('takes the bolted fault current from the short-circuit engine', () => {
    const sc = shortCircuit(model).buses.find((b) => b.id === 'MCC')!;
    expectClose(mcc.boltedFaultKa, sc.boltedFaultKa, 1e-12);
  });

  it('takes both arcing currents from IEEE 1584-2018 Eqs. (1), (25), (2) with the class typical gap', () => {
    // IEEE 1584-2018 typical gap of low-voltage MCCs and panelboards: 25 mm (Table 8; from memory, see equipmentClasses).
    expect(mcc.equipment!.gapMm).toBe(25);
    const a = computeArcingCurrents({
      voltageV: 480,
      boltedFaultKa: mcc.boltedFaultKa,
      electrodeConfig: 'VCB',
      gapMm: 25,
    });
    expectClose(mcc.arcingCurrentKa!.full, a.arcingCurrentKa.full, 1e-12);
    expectClose(mcc.arcingCurrentKa!.reduced, a.arcingCurrentKa.reduced, 1e-12);
  });

  it('gives each device the bolted branch current × Iarc/Ibf, at its own voltage', () => {
    const fault = createShortCircuitSolver(model).faultAt('MCC');
    const full = mcc.cases.find((c) => c.arcCase === 'full' && c.location === 'load-side')!;
    const scale = full.arcingCurrentKa / mcc.boltedFaultKa;
    const feeder = full.devices.find((d) => d.deviceId === 'CB-MCC')!;
    expectClose(feeder.currentA, fault.branches.find((b) => b.id === 'F-MCC')!.fromCurrentA * scale, 1e-12);
    // Radial: the whole fault current passes the feeder (Kirchhoff), so it sees the bus arcing current.
    expectClose(feeder.currentA, full.arcingCurrentKa * 1000, 1e-6);
    // Across the transformer the current scales by the voltage ratio 0.48/12.47 (ideal transformer, per-unit practice).
    const relay = full.devices.find((d) => d.deviceId === 'R-TX')!;
    expectClose(relay.currentA, feeder.currentA * (0.48 / 12.47), 1e-6);
    // The panel feeder is downstream of the fault: it carries no fault current and is not on the path.
    expect(full.devices.find((d) => d.deviceId === 'CB-PNL')).toBeUndefined();
  });

  it('reads each clearing time from the device band at the current it sees', () => {
    for (const c of mcc.cases) {
      for (const d of c.devices) {
        const placed = model.devices.find((p) => p.id === d.deviceId)!;
        const r = clearingTime(placed.device, d.currentA);
        expect(d.clearingTimeS).toBe(r.clearingTimeS);
        expect(d.region).toBe(r.region);
      }
    }
  });

  it('with one source the first device to clear ends the arc, and the energy is the IEEE 1584-2018 energy at that time', () => {
    for (const c of mcc.cases) {
      const fastest = c.devices
        .filter((d) => d.clearingTimeS !== null)
        .sort((a, b) => a.clearingTimeS! - b.clearingTimeS!)[0];
      expect(c.clearingDeviceId).toBe(fastest.deviceId);
      expectClose(c.arcDurationS, fastest.clearingTimeS!, 1e-12);
      expect(c.intervals).toHaveLength(1);
    }
    const full = mcc.cases.find((c) => c.arcCase === 'full')!;
    const reduced = mcc.cases.find((c) => c.arcCase === 'reduced')!;
    const direct = computeIncidentEnergy({
      voltageV: 480,
      boltedFaultKa: mcc.boltedFaultKa,
      electrodeConfig: 'VCB',
      gapMm: 25,
      workingDistanceMm: mcc.equipment!.workingDistanceMm,
      enclosureMm: mcc.equipment!.enclosureMm ?? undefined,
      clearingMs: { full: full.arcDurationS * 1000, reduced: reduced.arcDurationS * 1000 },
    });
    expectClose(full.incidentEnergyJPerCm2, direct.cases.full.incidentEnergyJPerCm2, 1e-9);
    expectClose(reduced.incidentEnergyJPerCm2, direct.cases.reduced.incidentEnergyJPerCm2, 1e-9);
    expectClose(full.arcFlashBoundaryMm, direct.cases.full.arcFlashBoundaryMm, 1e-9);
    // The worse of the two cases governs (IEEE 1584-2018: report the larger energy).
    expect(mcc.governing!.arcCase).toBe(direct.governingCase);
    expectClose(mcc.incidentEnergyCalPerCm2!, direct.incidentEnergyCalPerCm2, 1e-9);
    // 1 cal = 4.184 J.
    expectClose(mcc.incidentEnergyJPerCm2!, mcc.incidentEnergyCalPerCm2! * 4.184, 1e-12);
  });

  it('says in a sentence which device clears, in which region, at what current', () => {
    const full = mcc.cases.find((c) => c.arcCase === 'full')!;
    expect(full.sentence).toContain('at MCC');
    expect(full.sentence).toContain(full.clearingDeviceId!);
    expect(full.sentence).toMatch(
      /clears in its (instantaneous region|long-time band|short-time band|inverse-time curve)/,
    );
  });

  it('carries label values for the governing energy', () => {
    expect(mcc.labelValues!.incidentEnergyCalPerCm2).toBe(mcc.incidentEnergyCalPerCm2);
    // NFPA 70E Table 130.4(E)(a), 151–750 V: restricted approach 1 ft 0 in (0.3 m).
    expect(mcc.labelValues!.shockApproach!.restrictedApproach.text).toContain('0.3 m');
  });
});

describe('line side of the main (docs/ARCHITECTURE.md, Data path of a study run, step 8)', () => {
  it('evaluates an arc on the line side of a non-isolated main as cleared by the next device upstream, and labels the worse', () => {
    const r = runStudy(parse(radial({ mainIsolated: false }))).buses.find((b) => b.busId === 'SWBD')!;
    const loadFull = r.cases.find((c) => c.location === 'load-side' && c.arcCase === 'full')!;
    const lineFull = r.cases.find((c) => c.location === 'line-side' && c.arcCase === 'full')!;
    expect(loadFull.clearingDeviceId).toBe('CB-MAIN');
    expect(lineFull.devices.map((d) => d.deviceId)).not.toContain('CB-MAIN');
    expect(lineFull.clearingDeviceId).toBe('R-TX');
    // Energy is proportional to the arc duration at a given current (IEEE 1584-2018 Eq. 6).
    expectClose(
      lineFull.incidentEnergyJPerCm2 / loadFull.incidentEnergyJPerCm2,
      lineFull.arcDurationS / loadFull.arcDurationS,
      1e-9,
    );
    const worst = r.cases.reduce((g, c) => (c.incidentEnergyJPerCm2 > g.incidentEnergyJPerCm2 ? c : g));
    expect(r.governing).toEqual({ arcCase: worst.arcCase, location: worst.location });
    expect(r.governing!.location).toBe('line-side');
  });

  it('an isolated main gives no line-side case', () => {
    const r = runStudy(parse(radial())).buses.find((b) => b.busId === 'SWBD')!;
    expect(r.cases.every((c) => c.location === 'load-side')).toBe(true);
  });
});

describe('two sources: time-stepped energy', () => {
  /** A switchboard fed by the utility transformer and by a standby generator whose breaker opens first. */
  function twoSource(): ModelInput {
    const m = radial();
    m.buses.push({ id: 'GEN-BUS', name: 'Generator terminals', nominalKv: 0.48 });
    // A machine without decrement (X'd = Xd = X"d, time constants given): its current stays constant, so these checks
    // isolate the time stepping. A decaying machine is checked in study-time-varying.test.ts.
    m.sources!.push({
      id: 'GEN',
      kind: 'generator',
      bus: 'GEN-BUS',
      kva: 1000,
      kv: 0.48,
      subtransientPct: 15,
      transientPct: 15,
      synchronousPct: 15,
      subtransientTimeConstantS: 0.02,
      transientTimeConstantS: 0.5,
      xr: 20,
    });
    m.cables!.push({
      id: 'F-GEN',
      fromBus: 'GEN-BUS',
      toBus: 'SWBD',
      lengthM: 15,
      sets: 3,
      size: '500',
      material: 'Cu',
      conduit: 'steel',
    });
    m.devices!.push({
      id: 'CB-GEN',
      name: 'Generator breaker',
      branch: 'F-GEN',
      end: 'to',
      device: { kind: 'relay', curve: 'IEC-SI', pickupA: 1000, timeDial: 0.05, breakerCycles: 3 },
    });
    return m;
  }
  const model = parse(twoSource());
  const bus = runStudy(model).buses.find((b) => b.busId === 'SWBD')!;
  const full = bus.cases.find((c) => c.arcCase === 'full')!;

  it('splits the fault between the sources, the shares adding to 1', () => {
    expect(full.sources.map((s) => s.sourceId).sort()).toEqual(['GEN', 'UTIL']);
    expectClose(
      full.sources.reduce((s, x) => s + x.share, 0),
      1,
      1e-12,
    );
  });

  it('cuts each source off when its path opens, the generator first, then the utility main', () => {
    const gen = full.sources.find((s) => s.sourceId === 'GEN')!;
    const util = full.sources.find((s) => s.sourceId === 'UTIL')!;
    expect(gen.cutByDeviceId).toBe('CB-GEN');
    expect(util.cutByDeviceId).toBe('CB-MAIN');
    expect(gen.stopsAtS).toBeLessThan(util.stopsAtS);
    expect(full.intervals).toHaveLength(2);
    expect(full.intervals[0].sourceIds.sort()).toEqual(['GEN', 'UTIL']);
    expect(full.intervals[1].sourceIds).toEqual(['UTIL']);
    expectClose(full.intervals[1].boltedFaultKa, bus.boltedFaultKa * util.share, 1e-12);
    expect(full.clearingDeviceId).toBe('CB-MAIN');
  });

  it('adds the energy of each interval (E ∝ T at a given current, IEEE 1584-2018 Eq. 6)', () => {
    const eq = bus.equipment!;
    const enclosure = resolveEnclosure(
      { electrodeConfig: 'VCB', voltageV: 480, gapMm: eq.gapMm },
      eq.enclosureMm ?? undefined,
    );
    let sum = 0;
    for (const i of full.intervals) {
      const a = computeArcingCurrents({
        voltageV: 480,
        boltedFaultKa: i.boltedFaultKa,
        electrodeConfig: 'VCB',
        gapMm: eq.gapMm,
      });
      sum += computeCaseEnergy(
        a,
        'full',
        enclosure.enclosureCorrectionFactor,
        (i.toS - i.fromS) * 1000,
        eq.workingDistanceMm,
      ).incidentEnergyJPerCm2;
    }
    expectClose(full.incidentEnergyJPerCm2, sum, 1e-9);
    // Bracketed by "both sources for the whole time" and "the utility alone for the whole time".
    const both = computeIncidentEnergy({
      voltageV: 480,
      boltedFaultKa: bus.boltedFaultKa,
      electrodeConfig: 'VCB',
      gapMm: eq.gapMm,
      workingDistanceMm: eq.workingDistanceMm,
      enclosureMm: eq.enclosureMm ?? undefined,
      arcDurationMs: full.arcDurationS * 1000,
    });
    expect(full.incidentEnergyJPerCm2).toBeLessThan(both.cases.full.incidentEnergyJPerCm2);
  });

  it('places the boundary where the summed energy is 5.0 J/cm² (IEEE 1584-2018 definition of the arc-flash boundary)', () => {
    const eq = bus.equipment!;
    const enclosure = resolveEnclosure(
      { electrodeConfig: 'VCB', voltageV: 480, gapMm: eq.gapMm },
      eq.enclosureMm ?? undefined,
    );
    let atBoundary = 0;
    for (const i of full.intervals) {
      const a = computeArcingCurrents({
        voltageV: 480,
        boltedFaultKa: i.boltedFaultKa,
        electrodeConfig: 'VCB',
        gapMm: eq.gapMm,
      });
      atBoundary += computeCaseEnergy(
        a,
        'full',
        enclosure.enclosureCorrectionFactor,
        (i.toS - i.fromS) * 1000,
        full.arcFlashBoundaryMm,
      ).incidentEnergyJPerCm2;
    }
    expectClose(atBoundary, BOUNDARY_ENERGY_J_PER_CM2, 1e-6);
  });
});

describe('the arc-duration cap and motors', () => {
  it('caps at 2 s with a warning when no device clears (IEEE 1584 2 s guidance)', () => {
    const m = radial();
    m.devices = []; // nothing protects anything
    const bus = runStudy(parse(m)).buses.find((b) => b.busId === 'MCC')!;
    for (const c of bus.cases) {
      expect(c.arcDurationCapped).toBe(true);
      expectClose(c.arcDurationS, 2, 1e-12);
    }
    expect(bus.warnings.map((w) => w.code)).toContain('ARC_DURATION_CAPPED');
    expect(bus.clearingDeviceId).toBeNull();
  });

  it('uses the organization cap when set', () => {
    const m = radial();
    m.devices = [];
    const bus = createStudyRunner(parse(m), { maxArcDurationMs: 1000 }).runBus('MCC');
    expectClose(bus.arcDurationS!, 1, 1e-12);
  });

  it('stops a motor contribution after the decay time in the step model (common practice, no source)', () => {
    const m = radial();
    m.motors = [{ id: 'P-1', bus: 'MCC', hp: 200, kv: 0.46 }];
    const bus = createStudyRunner(parse(m), { motorDecayModel: 'step', motorDecayCycles: 5 }).runBus('MCC');
    const full = bus.cases.find((c) => c.arcCase === 'full')!;
    const motor = full.sources.find((s) => s.sourceId === 'P-1')!;
    expect(motor.reason).toBe('motor-decay');
    expectClose(motor.stopsAtS, 5 / 60, 1e-12);
    expect(motor.share).toBeGreaterThan(0);
  });
});

describe('problems stay with their bus', () => {
  it('a bus outside the model voltage range gets an error, the others still run', () => {
    const m = radial();
    m.buses[0].equipment = { class: 'switchgear-15kv' };
    m.buses[0].nominalKv = 12.47;
    m.buses.push({ id: 'HV', name: 'Transmission', nominalKv: 34.5, equipment: { class: 'switchgear-15kv' } });
    m.transformers!.push({
      id: 'TX-HV',
      fromBus: 'HV',
      toBus: 'SWGR',
      kva: 10000,
      primaryKv: 34.5,
      secondaryKv: 12.47,
      impedancePct: 7,
      xr: 15,
    });
    const r = runStudy(parse(m));
    const hv = r.buses.find((b) => b.busId === 'HV')!;
    expect(hv.status).toBe('error');
    expect(hv.error!.message).toMatch(/IEEE 1584-2018/);
    expect(r.buses.find((b) => b.busId === 'SWGR')!.status).toBe('ok');
  });
});
