/**
 * A protective device's operation under a current that changes with time (IEEE C37.112-2018, the integral form of
 * the inverse-time characteristic for time-varying current — the "disk emulation" integral):
 *
 *   an element operates when  ∫ dt / t(I(t)) = 1
 *
 * where t(I) is the element's operating time at a constant current I (its maximum, total-clearing curve). A
 * definite-time or instantaneous element has t(I) constant above its pickup, so the same integral says "operates
 * when the current has stayed above the pickup for the delay". A current below an element's pickup (its curve shows
 * no trip) resets that element's progress to zero: the conservative reading (a slower operation, a longer arc), also
 * for fuses, whose melting progress is taken as lost. The device operates when its first element does.
 *
 * The current is piecewise constant over the steps the caller gives (`advance`); within a step the crossing is
 * solved exactly, so a constant current gives exactly the constant-current time. The breaker or arcing time that a
 * maximum curve includes is integrated with it (conservative: it stretches when the current falls).
 */
import type { Device, TripRegion } from '../../../shared/schemas/device';
import { readBand, type BandReading } from '../trip';

export interface ElementDropout {
  element: string;
  /** When the current fell below the element's pickup after it had started timing, s. */
  atS: number;
  /** Progress lost (0…1). */
  progress: number;
}

export interface TripIntegrator {
  /** Time from now until the device operates if `currentA` stays constant; Infinity when no element trips. */
  timeToOperateS(currentA: number): number;
  /** Holds `currentA` for `dtS` from `atS`; returns true when the device operates at the end of the step. */
  advance(currentA: number, atS: number, dtS: number): boolean;
  /** The element that operated, its region and the current then (after `advance` returned true). */
  readonly operated: { element: string; region: TripRegion; currentA: number } | null;
  readonly dropouts: ElementDropout[];
}

/** Relative slack for "the progress reached 1" (float sums of dt/t). */
const PROGRESS_SLACK = 1e-9;

/** `readBand` of the device (a study passes its `BandReader`'s, which reads each current once). */
export function createTripIntegrator(
  device: Device,
  readBandAt: (currentA: number) => BandReading = (currentA) => readBand(device, currentA),
): TripIntegrator {
  return new Integrator(readBandAt);
}

/** A class rather than an object literal with a getter: a study creates one per device and case (cheaper to build). */
class Integrator implements TripIntegrator {
  private readonly progress = new Map<string, number>();
  readonly dropouts: ElementDropout[] = [];
  private operatedAt: TripIntegrator['operated'] = null;
  private cacheCurrentA = NaN;
  private cacheBand: BandReading | null = null;

  constructor(private readonly readBandAt: (currentA: number) => BandReading) {}

  get operated(): TripIntegrator['operated'] {
    return this.operatedAt;
  }

  private read(currentA: number): BandReading | null {
    // NaN never equals itself: the first read always reads.
    if (this.cacheCurrentA === currentA) return this.cacheBand;
    const band = currentA > 0 && Number.isFinite(currentA) ? this.readBandAt(currentA) : null;
    this.cacheCurrentA = currentA;
    this.cacheBand = band;
    return band;
  }

  private remainingS(el: BandReading['elements'][number]): number {
    if (el.maxS === null) return Infinity;
    return Math.max(0, 1 - (this.progress.get(el.element) ?? 0)) * el.maxS;
  }

  timeToOperateS(currentA: number): number {
    const band = this.read(currentA);
    if (!band) return Infinity;
    let best = Infinity;
    for (const el of band.elements) best = Math.min(best, this.remainingS(el));
    return best;
  }

  advance(currentA: number, atS: number, dtS: number): boolean {
    const { progress, dropouts } = this;
    const band = this.read(currentA);
    let first: { element: string; region: TripRegion; remaining: number } | null = null;
    const seen = new Set<string>();
    for (const el of band?.elements ?? []) {
      seen.add(el.element);
      const before = progress.get(el.element) ?? 0;
      if (el.maxS === null) {
        if (before > 0) dropouts.push({ element: el.element, atS, progress: before });
        progress.set(el.element, 0);
        continue;
      }
      const remaining = this.remainingS(el);
      const after = el.maxS > 0 ? before + dtS / el.maxS : 1;
      progress.set(el.element, after);
      if (after >= 1 - PROGRESS_SLACK && (!first || remaining < first.remaining))
        first = { element: el.element, region: el.region, remaining };
    }
    // No current (the source feeding it is cut): every element resets.
    for (const [element, p] of progress) {
      if (seen.has(element) || p <= 0) continue;
      dropouts.push({ element, atS, progress: p });
      progress.set(element, 0);
    }
    if (first) this.operatedAt = { element: first.element, region: first.region, currentA };
    return first !== null;
  }
}

/**
 * Operating time under a piecewise-constant current (`segments`: each current holds until `untilS`; the last one
 * holds on). Null when the device does not operate within `maxS`.
 */
export function operatingTimeS(
  device: Device,
  segments: readonly { untilS: number; currentA: number }[],
  maxS = Infinity,
): { timeS: number; element: string; region: TripRegion } | null {
  const integrator = createTripIntegrator(device);
  let t = 0;
  for (let i = 0; i < segments.length && t < maxS; i++) {
    const { currentA } = segments[i];
    const end = Math.min(i === segments.length - 1 ? Infinity : segments[i].untilS, maxS);
    if (end <= t) continue;
    const tto = integrator.timeToOperateS(currentA);
    if (Number.isFinite(tto) && t + tto <= end) {
      integrator.advance(currentA, t, tto);
      const op = integrator.operated as NonNullable<TripIntegrator['operated']>;
      return { timeS: t + tto, element: op.element, region: op.region };
    }
    if (!Number.isFinite(end)) return null;
    integrator.advance(currentA, t, end - t);
    t = end;
  }
  return null;
}
