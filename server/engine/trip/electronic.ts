import type { ElectronicDevice } from '../../../shared/schemas/device';
import type { EngineWarning } from '../errors';
import { ELECTRONIC_CONVENTIONS, longTimeI2tS, shortTimeDelayS } from './equations';
import {
  above,
  atOrAbove,
  combineElements,
  dedupeWarnings,
  pickupEdges,
  requireNonNegative,
  requirePercent,
  requirePositive,
  type BandReading,
  type ElementReading,
  type PickupEdges,
} from './elements';
import { fmt } from './interpolate';

export interface ElectronicSettings {
  sensorA: number;
  /** Long-time pickup Ir = longTime.pickup × In, amperes, with tolerance edges. */
  longTime: PickupEdges & { delayS: number; delayMultiple: number; irA: number };
  shortTime: (PickupEdges & { delayS: number; i2t: boolean; i2tMultiple: number }) | null;
  instantaneous: PickupEdges | null;
  groundFault: { pickupA: number; delayS: number } | null;
  pickupTolerancePct: number;
  timeTolerancePct: number;
  clearingS: number;
  instantaneousMinimumS: number;
}

/**
 * Resolved settings of an electronic trip unit in amperes and seconds.
 * Ir = longTime.pickup × sensorA; short-time pickup = shortTime.pickup × Ir; instantaneous pickup =
 * instantaneous.pickup × sensorA. Conventions where the device does not say (common practice, from memory):
 * long-time delay stated at 6 × Ir, short-time I²t ramp meeting the flat delay at 10 × Ir, instantaneous
 * minimum (no-trip) time 0.01 s.
 */
export function electronicSettings(device: ElectronicDevice): ElectronicSettings {
  const sensorA = requirePositive(device.sensorA, 'device.sensorA');
  const tolI = requirePercent(device.pickupTolerancePct, 'device.pickupTolerancePct', 99);
  const tolT =
    device.timeTolerancePct === undefined ? 0 : requirePercent(device.timeTolerancePct, 'device.timeTolerancePct', 99);
  const clearingS = requirePositive(device.clearingS, 'device.clearingS');
  const irA = requirePositive(device.longTime.pickup, 'device.longTime.pickup') * sensorA;
  const ltEdges = pickupEdges(irA, tolI);
  const longTime = {
    nominalA: ltEdges.nominalA,
    lowA: ltEdges.lowA,
    highA: ltEdges.highA,
    irA,
    delayS: requirePositive(device.longTime.delayS, 'device.longTime.delayS'),
    delayMultiple:
      device.longTime.delayMultiple === undefined
        ? ELECTRONIC_CONVENTIONS.longTimeDelayMultiple
        : requirePositive(device.longTime.delayMultiple, 'device.longTime.delayMultiple'),
  };
  const stEdges = device.shortTime
    ? pickupEdges(requirePositive(device.shortTime.pickup, 'device.shortTime.pickup') * irA, tolI)
    : null;
  const shortTime = device.shortTime
    ? {
        nominalA: (stEdges as PickupEdges).nominalA,
        lowA: (stEdges as PickupEdges).lowA,
        highA: (stEdges as PickupEdges).highA,
        delayS: requirePositive(device.shortTime.delayS, 'device.shortTime.delayS'),
        i2t: device.shortTime.i2t === true,
        i2tMultiple:
          device.shortTime.i2tMultiple === undefined
            ? ELECTRONIC_CONVENTIONS.shortTimeI2tMultiple
            : requirePositive(device.shortTime.i2tMultiple, 'device.shortTime.i2tMultiple'),
      }
    : null;
  const instantaneous = device.instantaneous
    ? pickupEdges(requirePositive(device.instantaneous.pickup, 'device.instantaneous.pickup') * sensorA, tolI)
    : null;
  const groundFault = device.groundFault
    ? {
        pickupA: requirePositive(device.groundFault.pickupA, 'device.groundFault.pickupA'),
        delayS: requireNonNegative(device.groundFault.delayS, 'device.groundFault.delayS'),
      }
    : null;
  const instantaneousMinimumS = Math.min(
    device.instantaneousMinimumS === undefined
      ? ELECTRONIC_CONVENTIONS.instantaneousMinimumS
      : requirePositive(device.instantaneousMinimumS, 'device.instantaneousMinimumS'),
    clearingS,
  );
  return {
    sensorA,
    longTime,
    shortTime,
    instantaneous,
    groundFault,
    pickupTolerancePct: tolI,
    timeTolerancePct: tolT,
    clearingS,
    instantaneousMinimumS,
  };
}

function toleranceWarning(name: string, currentA: number, edges: PickupEdges): EngineWarning {
  return {
    code: 'WITHIN_PICKUP_TOLERANCE',
    message: `${fmt(currentA)} A lies within the ${name} pickup tolerance (${fmt(edges.lowA)}–${fmt(edges.highA)} A): the maximum curve does not count on that element`,
  };
}

/**
 * Band of an electronic trip unit at one phase current.
 * Each element's maximum curve starts at the HIGH edge of its pickup tolerance (the unit may pick up that
 * late) and uses the upper time band plus the breaker clearing time; its minimum curve starts just above the
 * LOW edge (where the unit must still not trip) and uses the lower time band. The fastest element governs each edge (reference notes: band construction).
 * - long-time (I²t): t = delayS · (delayMultiple / M)², M = I / Ir
 * - short-time: flat t = tsd, or I²t in: t = max(tsd, tsd · (i2tMultiple / M)²)
 * - instantaneous: maximum = clearingS, minimum = instantaneousMinimumS
 * The ground-fault element responds to residual current only and is not applied to the (balanced)
 * three-phase arcing current; it is listed in the trace.
 */
export function electronicBand(
  device: ElectronicDevice,
  currentA: number,
  s: ElectronicSettings = electronicSettings(device),
): BandReading {
  const up = 1 + s.timeTolerancePct / 100;
  const down = 1 - s.timeTolerancePct / 100;
  const multipleOfIr = currentA / s.longTime.irA;
  const elements: ElementReading[] = [];
  const toleranceNotes: EngineWarning[] = [];
  const within = (edges: PickupEdges) => above(currentA, edges.lowA) && !atOrAbove(currentA, edges.highA);

  if (s.instantaneous) {
    const edges = s.instantaneous;
    if (within(edges)) toleranceNotes.push(toleranceWarning('instantaneous', currentA, edges));
    elements.push({
      element: 'instantaneous',
      region: 'instantaneous',
      maxS: atOrAbove(currentA, edges.highA) ? s.clearingS : null,
      minS: above(currentA, edges.lowA) ? s.instantaneousMinimumS : null,
      // Written out rather than spread: a spread followed by more keys makes a slow object (same keys, same order).
      detail: {
        pickupA: edges.nominalA,
        lowEdgeA: edges.lowA,
        highEdgeA: edges.highA,
        multipleOfSensor: currentA / s.sensorA,
        clearingS: s.clearingS,
      },
      maxWarnings: [],
      minWarnings: [],
    });
  }
  if (s.shortTime) {
    const st = s.shortTime;
    if (within(st)) toleranceNotes.push(toleranceWarning('short-time', currentA, st));
    const nominalS = shortTimeDelayS(multipleOfIr, st.delayS, st.i2t, st.i2tMultiple);
    const onRamp = st.i2t && multipleOfIr < st.i2tMultiple;
    elements.push({
      element: 'short-time',
      region: 'short-time',
      maxS: atOrAbove(currentA, st.highA) ? nominalS * up + s.clearingS : null,
      minS: above(currentA, st.lowA) ? nominalS * down : null,
      detail: {
        pickupA: st.nominalA,
        lowEdgeA: st.lowA,
        highEdgeA: st.highA,
        multipleOfIr,
        delayS: st.delayS,
        shape: st.i2t ? (onRamp ? 'i2t-ramp' : 'flat (i2t in, above ramp)') : 'flat',
        i2tMultiple: st.i2t ? st.i2tMultiple : undefined,
        nominalS,
      },
      maxWarnings: [],
      minWarnings: [],
    });
  }
  const lt = s.longTime;
  if (within(lt)) toleranceNotes.push(toleranceWarning('long-time', currentA, lt));
  const ltNominalS = longTimeI2tS(multipleOfIr, lt.delayS, lt.delayMultiple);
  elements.push({
    element: 'long-time',
    region: 'long-time',
    maxS: atOrAbove(currentA, lt.highA) ? ltNominalS * up + s.clearingS : null,
    minS: above(currentA, lt.lowA) ? ltNominalS * down : null,
    detail: {
      pickupA: lt.nominalA,
      lowEdgeA: lt.lowA,
      highEdgeA: lt.highA,
      multipleOfIr,
      delayS: lt.delayS,
      delayMultiple: lt.delayMultiple,
      nominalS: ltNominalS,
    },
    maxWarnings: [],
    minWarnings: [],
  });

  const band = combineElements(elements);
  // Within an element's pickup tolerance its maximum curve is null, so it never governs there: say so.
  band.warnings = dedupeWarnings([...band.warnings, ...toleranceNotes]);
  if (s.groundFault) {
    band.elements.push({
      element: 'ground-fault',
      region: 'no-trip',
      maxS: null,
      minS: null,
      detail: {
        pickupA: s.groundFault.pickupA,
        delayS: s.groundFault.delayS,
        note: 'residual-current element; not applied to the three-phase arcing current',
      },
      maxWarnings: [],
      minWarnings: [],
    });
  }
  return band;
}
