/**
 * Pure edits of a placed device's settings (the device settings editor of the model editor). Every function returns
 * a new object and leaves its input untouched.
 *
 * Library provenance (docs/MODEL-FORMAT.md, Devices): `library` names the device type the device was taken from and,
 * for an electronic trip unit, the switch positions chosen. Choosing other positions of the same trip-unit type keeps
 * `library` (with the new positions). Changing a setting by number makes the device no longer that type: `library` is
 * dropped and the device is named "Modified from <type name>", so the model still says where it came from.
 */
import type {
  Device,
  ElectronicDevice,
  ElectronicPositions,
  ElectronicSettingName,
  ElectronicTripType,
  RelayDevice,
  ThermalMagneticDevice,
} from '../../../shared/schemas/device';
import type { DeviceType } from '../../../shared/schemas/deviceLibrary';
import type { ModelInput } from '../../../shared/schemas/model';
import type { PlacedDeviceInput } from '../summaries';

const MODIFIED_PREFIX = 'Modified from ';

/** The name a device gets when its settings are changed away from a library type. */
export function modifiedName(libraryName: string): string {
  return `${MODIFIED_PREFIX}${libraryName}`.slice(0, 160);
}

/** The library type a changed device was taken from ("Modified from X" → "X"), or null. */
export function modifiedFrom(d: PlacedDeviceInput): string | null {
  const name = (d.device as Device | undefined)?.name;
  return name && name.startsWith(MODIFIED_PREFIX) ? name.slice(MODIFIED_PREFIX.length) : null;
}

/** Where the device's settings come from, for the editor's heading. */
export type Provenance =
  { kind: 'library'; name: string } | { kind: 'modified'; name: string } | { kind: 'custom' } | { kind: 'none' };

export function provenance(d: PlacedDeviceInput): Provenance {
  if (d.library) return { kind: 'library', name: d.library.name };
  const from = modifiedFrom(d);
  if (from) return { kind: 'modified', name: from };
  return d.device ? { kind: 'custom' } : { kind: 'none' };
}

function sameJson(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * The placed device with new raw settings. A device taken from the library loses `library` and is named
 * "Modified from <type>"; a device not from the library keeps its name. Unchanged settings return `d` itself.
 */
export function withSettings(d: PlacedDeviceInput, device: Device): PlacedDeviceInput {
  if (sameJson(d.device, device)) return d;
  if (!d.library) return { ...d, device };
  const { library, ...rest } = d;
  return { ...rest, device: { ...device, name: modifiedName(library.name) } };
}

/** The placed device with new switch positions of its library trip-unit type, resolved to `resolved` (by the server). */
export function withPositions(
  d: PlacedDeviceInput,
  positions: ElectronicPositions,
  resolved: ElectronicDevice,
): PlacedDeviceInput {
  if (!d.library) return withSettings(d, resolved);
  return { ...d, device: resolved, library: { ...d.library, positions } };
}

/** The library trip-unit type of an electronic device taken from the library with its positions, or null. */
export function tripUnitTypeOf(
  d: PlacedDeviceInput,
  typesById: ReadonlyMap<string, DeviceType>,
): { tripType: ElectronicTripType; positions: ElectronicPositions } | null {
  if (!d.library?.positions) return null;
  const t = typesById.get(d.library.deviceTypeId);
  if (!t || t.definition.kind !== 'electronic') return null;
  return { tripType: t.definition.tripType, positions: d.library.positions };
}

/** The switches of a trip-unit type in the library's order, each with its position names. */
export function tripUnitSwitches(tripType: ElectronicTripType): { name: ElectronicSettingName; positions: string[] }[] {
  const settings = tripType.settings as Partial<Record<ElectronicSettingName, { positions: Record<string, number> }>>;
  const order: ElectronicSettingName[] = [
    'ratingPlug',
    'longTimePickup',
    'longTimeDelay',
    'shortTimePickup',
    'shortTimeDelay',
    'shortTimeI2t',
    'instantaneousPickup',
    'groundFaultPickup',
    'groundFaultDelay',
  ];
  return order.flatMap((name) => {
    const s = settings[name];
    return s ? [{ name, positions: Object.keys(s.positions) }] : [];
  });
}

// ---------------------------------------------------------------------------------------------
// Relay

/** How the relay's pickups are given: primary amperes, or a CT ratio with secondary amperes. */
export type PickupMode = 'primary' | 'ct';

export function relayPickupMode(r: RelayDevice): PickupMode {
  return r.pickupA === undefined && (r.ctRatio !== undefined || r.pickupSecondaryA !== undefined) ? 'ct' : 'primary';
}

const finite = (v: number | undefined): v is number => v !== undefined && Number.isFinite(v);

/**
 * The relay with its pickups given the other way. Through the CT ratio the values convert exactly
 * (primary = ratio × secondary); without a ratio the secondary values are left for the engineer to enter.
 */
export function withRelayPickupMode(r: RelayDevice, mode: PickupMode): RelayDevice {
  if (relayPickupMode(r) === mode) return r;
  const { pickupA, pickupSecondaryA, instantaneousA, instantaneousSecondaryA, ctRatio, definiteTime, ...rest } = r;
  const ratio = finite(ctRatio) && ctRatio > 0 ? ctRatio : undefined;
  if (mode === 'ct') {
    const dt = definiteTime
      ? (() => {
          const { pickupA: dtA, pickupSecondaryA: _s, ...d } = definiteTime;
          return { ...d, ...(ratio && finite(dtA) ? { pickupSecondaryA: dtA / ratio } : {}) };
        })()
      : undefined;
    return {
      ...rest,
      ...(ctRatio !== undefined ? { ctRatio } : {}),
      ...(ratio && finite(pickupA) ? { pickupSecondaryA: pickupA / ratio } : {}),
      ...(ratio && finite(instantaneousA) ? { instantaneousSecondaryA: instantaneousA / ratio } : {}),
      ...(dt ? { definiteTime: dt } : {}),
    } as RelayDevice;
  }
  const dt = definiteTime
    ? (() => {
        const { pickupSecondaryA: dtS, pickupA: _a, ...d } = definiteTime;
        return { ...d, ...(ratio && finite(dtS) ? { pickupA: dtS * ratio } : {}) };
      })()
    : undefined;
  return {
    ...rest,
    ...(ctRatio !== undefined ? { ctRatio } : {}),
    ...(ratio && finite(pickupSecondaryA) ? { pickupA: pickupSecondaryA * ratio } : {}),
    ...(ratio && finite(instantaneousSecondaryA) ? { instantaneousA: instantaneousSecondaryA * ratio } : {}),
    ...(dt ? { definiteTime: dt } : {}),
  } as RelayDevice;
}

/** Inverse-time pickup in primary amperes (given, or through the CT ratio); undefined when not known. */
export function relayPickupPrimaryA(r: RelayDevice): number | undefined {
  if (finite(r.pickupA)) return r.pickupA;
  if (finite(r.ctRatio) && finite(r.pickupSecondaryA)) return r.ctRatio * r.pickupSecondaryA;
  return undefined;
}

/** Instantaneous pickup in primary amperes (given, or through the CT ratio); undefined when off or not known. */
export function relayInstantaneousPrimaryA(r: RelayDevice): number | undefined {
  if (finite(r.instantaneousA)) return r.instantaneousA;
  if (finite(r.ctRatio) && finite(r.instantaneousSecondaryA)) return r.ctRatio * r.instantaneousSecondaryA;
  return undefined;
}

/** A copy with `key` set, or removed when `value` is undefined. */
export function setField<T extends object, K extends keyof T>(obj: T, key: K, value: T[K] | undefined): T {
  const next = { ...obj };
  if (value === undefined) delete next[key];
  else next[key] = value;
  return next;
}

// ---------------------------------------------------------------------------------------------
// Thermal-magnetic instantaneous

export type TmInstantaneousMode = 'none' | 'tolerance' | 'range';

export function tmInstantaneousMode(d: ThermalMagneticDevice): TmInstantaneousMode {
  const i = d.instantaneous;
  if (!i) return 'none';
  return i.lowMultiple !== undefined || i.highMultiple !== undefined ? 'range' : 'tolerance';
}

/**
 * The breaker with its instantaneous pickup given another way; the thermal band is kept as it is. A pickup with a
 * tolerance becomes the range it spans (pickup × (1 ± tolerance)); a range becomes its middle with the half-width as
 * tolerance, so switching back and forth keeps the same range.
 */
export function withTmInstantaneousMode(d: ThermalMagneticDevice, mode: TmInstantaneousMode): ThermalMagneticDevice {
  const current = tmInstantaneousMode(d);
  if (current === mode) return d;
  const { instantaneous, ...rest } = d;
  if (mode === 'none') return rest as ThermalMagneticDevice;
  const setting = instantaneous?.setting !== undefined ? { setting: instantaneous.setting } : {};
  if (mode === 'range') {
    const p = instantaneous?.pickupMultiple;
    const tol = instantaneous?.tolerancePct;
    return {
      ...rest,
      instantaneous:
        finite(p) && finite(tol)
          ? { lowMultiple: p * (1 - tol / 100), highMultiple: p * (1 + tol / 100), ...setting }
          : { ...setting },
    } as ThermalMagneticDevice;
  }
  const lo = instantaneous?.lowMultiple;
  const hi = instantaneous?.highMultiple;
  return {
    ...rest,
    instantaneous:
      finite(lo) && finite(hi) && lo + hi > 0
        ? { pickupMultiple: (lo + hi) / 2, tolerancePct: ((hi - lo) / (lo + hi)) * 100, ...setting }
        : { tolerancePct: 20, ...setting },
  } as ThermalMagneticDevice;
}

// ---------------------------------------------------------------------------------------------
// Where the device sits

/** The bus at the device: the bus at its end of the branch, or the bus of its source or motor. */
export function busOfDevice(d: PlacedDeviceInput, model: ModelInput): string | undefined {
  if (d.branch !== undefined) {
    const b = [...(model.transformers ?? []), ...(model.cables ?? []), ...(model.ties ?? [])].find(
      (x) => x.id === d.branch,
    );
    if (!b || !d.end) return undefined;
    return d.end === 'from' ? b.fromBus : b.toBus;
  }
  if (d.source !== undefined) {
    return (
      (model.sources ?? []).find((s) => s.id === d.source)?.bus ??
      (model.motors ?? []).find((m) => m.id === d.source)?.bus
    );
  }
  return undefined;
}

/** The index of the device being edited: `index` when it still holds `id`, else the device with that id, else -1. */
export function findDevice(model: ModelInput, index: number, id: string): number {
  const devices = model.devices ?? [];
  if (devices[index]?.id === id) return index;
  return devices.findIndex((d) => d.id === id);
}
