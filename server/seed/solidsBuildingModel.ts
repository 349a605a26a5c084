import type { ModelInput } from '../../shared/schemas/model';

/**
 * The invented Larkspur Valley solids handling building: a double-ended 480 V substation (two 1000 kVA transformers
 * on two 12.47 kV utility feeders, secondary mains, a normally open tie breaker), a dewatering MCC on side A with two
 * centrifuge motors, and a 350 kVA standby generator on side B. Its draft study describes the states the building
 * runs in as operating scenarios: the utility at its minimum, the tie closed during a closed-transition transfer,
 * and the generator alone. Every device and setting here is invented; none is a maker's data.
 */
export function solidsBuildingModel(): ModelInput {
  const main = (sensorA: number) => ({
    kind: 'electronic' as const,
    sensorA,
    longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
    shortTime: { pickup: 4, delayS: 0.3, i2t: false },
    pickupTolerancePct: 10,
    clearingS: 0.05,
  });
  const primaryRelay = {
    kind: 'relay' as const,
    curve: 'IEEE-VI' as const,
    ctRatio: 100 / 5,
    pickupSecondaryA: 3,
    timeDial: 2,
    instantaneousA: 1000,
    breakerCycles: 5,
  };
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Larkspur Valley Solids Handling Building',
    frequencyHz: 60,
    buses: [
      { id: 'SH-PRI-A', name: 'Feeder A terminal 12.47 kV', nominalKv: 12.47 },
      { id: 'SH-PRI-B', name: 'Feeder B terminal 12.47 kV', nominalKv: 12.47 },
      {
        id: 'SH-A',
        name: 'Double-ended substation, side A',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', mainIsolated: true },
      },
      {
        id: 'SH-B',
        name: 'Double-ended substation, side B',
        nominalKv: 0.48,
        equipment: { class: 'switchgear-lv', mainIsolated: true },
      },
      { id: 'SH-MCC', name: 'Dewatering MCC', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
      { id: 'SH-GEN-T', name: 'Standby generator terminals', nominalKv: 0.48 },
    ],
    sources: [
      { id: 'SH-UTIL-A', name: 'Utility feeder A', kind: 'utility', bus: 'SH-PRI-A', shortCircuitMva: 200, xr: 10 },
      { id: 'SH-UTIL-B', name: 'Utility feeder B', kind: 'utility', bus: 'SH-PRI-B', shortCircuitMva: 180, xr: 10 },
      {
        id: 'SH-GEN',
        name: 'Standby generator',
        kind: 'generator',
        bus: 'SH-GEN-T',
        kva: 350,
        kv: 0.48,
        subtransientPct: 15,
        xr: 15,
        sustainedCurrentMultiple: 3.5,
      },
    ],
    transformers: [
      {
        id: 'SH-TX-A',
        name: 'Substation transformer A',
        fromBus: 'SH-PRI-A',
        toBus: 'SH-A',
        kva: 1000,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 5.8,
      },
      {
        id: 'SH-TX-B',
        name: 'Substation transformer B',
        fromBus: 'SH-PRI-B',
        toBus: 'SH-B',
        kva: 1000,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 5.8,
      },
    ],
    cables: [
      {
        id: 'SH-F-MCC',
        name: 'Side A to dewatering MCC',
        fromBus: 'SH-A',
        toBus: 'SH-MCC',
        lengthM: 30,
        sets: 2,
        size: '250',
        material: 'Cu',
        conduit: 'steel',
      },
      {
        id: 'SH-F-GEN',
        name: 'Generator to side B',
        fromBus: 'SH-GEN-T',
        toBus: 'SH-B',
        lengthM: 25,
        sets: 2,
        size: '350',
        material: 'Cu',
        conduit: 'steel',
      },
    ],
    ties: [{ id: 'SH-TIE', name: 'Tie breaker A–B (normally open)', fromBus: 'SH-A', toBus: 'SH-B', closed: false }],
    motors: [
      { id: 'SH-M1', name: 'Centrifuge 1', bus: 'SH-MCC', hp: 150, kv: 0.46 },
      { id: 'SH-M2', name: 'Centrifuge 2', bus: 'SH-MCC', hp: 150, kv: 0.46 },
    ],
    devices: [
      { id: 'SH-R-A', name: 'Transformer A primary relay', branch: 'SH-TX-A', end: 'from', device: primaryRelay },
      { id: 'SH-R-B', name: 'Transformer B primary relay', branch: 'SH-TX-B', end: 'from', device: primaryRelay },
      { id: 'SH-CB-MA', name: 'Side A main', branch: 'SH-TX-A', end: 'to', device: main(1600) },
      { id: 'SH-CB-MB', name: 'Side B main', branch: 'SH-TX-B', end: 'to', device: main(1600) },
      {
        id: 'SH-CB-TIE',
        name: 'Tie breaker',
        branch: 'SH-TIE',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 1600,
          longTime: { pickup: 1, delayS: 10, delayMultiple: 6 },
          shortTime: { pickup: 4, delayS: 0.2, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
      {
        id: 'SH-CB-MCC',
        name: 'Dewatering MCC feeder',
        branch: 'SH-F-MCC',
        end: 'from',
        device: {
          kind: 'thermal-magnetic',
          ratingA: 400,
          thermal: {
            min: [
              [1.35, 250],
              [2, 28],
              [3, 9],
              [5, 2.8],
              [8, 0.9],
            ],
            max: [
              [1.35, 1400],
              [2, 95],
              [3, 38],
              [5, 11],
              [8, 4],
            ],
          },
          instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
          instantaneousClearingCycles: 1.5,
        },
      },
      {
        id: 'SH-CB-GEN',
        name: 'Generator breaker',
        branch: 'SH-F-GEN',
        end: 'from',
        device: {
          kind: 'electronic',
          sensorA: 600,
          longTime: { pickup: 0.8, delayS: 4, delayMultiple: 6 },
          shortTime: { pickup: 1.5, delayS: 0.1, i2t: false },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
      },
    ],
    scenarios: [
      {
        id: 'util-min',
        name: 'Utility at minimum',
        sources: { 'SH-UTIL-A': { shortCircuitMva: 15, xr: 4 }, 'SH-UTIL-B': { shortCircuitMva: 15, xr: 4 } },
      },
      {
        id: 'tie-closed',
        name: 'Closed-transition transfer: both feeders, tie closed',
        ties: { 'SH-TIE': { closed: true } },
      },
      {
        id: 'gen-only',
        name: 'Standby generator alone, tie closed',
        sources: { 'SH-UTIL-A': { inService: false }, 'SH-UTIL-B': { inService: false } },
        ties: { 'SH-TIE': { closed: true } },
        motors: { 'SH-M2': { inService: false } },
      },
    ],
  } as ModelInput;
}
