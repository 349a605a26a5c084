/**
 * Pure edits of a system model: new, duplicated and deleted elements, renamed ids (references follow), and field
 * updates that drop emptied optional fields. Every function returns a new model and leaves its input untouched.
 */
import { EQUIPMENT_CLASSES } from '../../shared/equipmentClasses';
import type { ModelInput } from '../../shared/schemas/model';
import {
  COLLECTIONS,
  itemsOf,
  type AnyElement,
  type BusInput,
  type CollectionKey,
  type ElementOf,
  type PlacedDeviceInput,
  uniqueId,
} from './summaries';
import { removeFromScenarios, renameInScenarios } from './scenarios';

export { uniqueId };

/** A copy of `obj` with `key` set, or removed when `value` is undefined (an empty optional field). */
export function withField<T extends object, K extends keyof T>(obj: T, key: K, value: T[K] | undefined): T {
  const next = { ...obj };
  if (value === undefined) delete next[key];
  else next[key] = value;
  return next;
}

/** Every id of the model, of all element kinds (ids are unique across kinds). */
export function allIds(model: ModelInput): Set<string> {
  const ids = new Set<string>();
  for (const c of COLLECTIONS) for (const e of itemsOf(model, c)) ids.add(e.id);
  return ids;
}

function setItems<C extends CollectionKey>(model: ModelInput, collection: C, items: ElementOf[C][]): ModelInput {
  return { ...model, [collection]: items } as ModelInput;
}

/** The equipment class typical for a nominal voltage (the first class whose voltage range holds it). */
export function classForKv(kv: number | undefined): string | undefined {
  if (kv === undefined || !Number.isFinite(kv)) return undefined;
  const v = kv * 1000;
  return EQUIPMENT_CLASSES.find(
    (c) => c.voltageClass !== 'any' && v >= c.nominalVoltageRangeV.min && v <= c.nominalVoltageRangeV.max,
  )?.id;
}

export type NewVariant = 'utility' | 'generator';

const ID_BASE: Record<CollectionKey, string> = {
  buses: 'BUS-1',
  sources: 'SRC-1',
  transformers: 'TX-1',
  cables: 'CBL-1',
  motors: 'M-1',
  ties: 'TIE-1',
  devices: 'DEV-1',
};

/**
 * A new element with a free id. Nameplate values are left empty for the engineer to enter (the checks then ask for
 * them); only settled defaults are filled: one set of copper in steel conduit, a closed tie, the first bus.
 */
export function newElement(model: ModelInput, collection: CollectionKey, variant?: NewVariant): AnyElement {
  const taken = allIds(model);
  const buses = model.buses;
  const firstBus = buses[0]?.id ?? '';
  const lastBus = buses[buses.length - 1];
  // Elements are created incomplete on purpose: the schema's issues then show what is still to be entered.
  const partial = <T>(e: object) => e as T;
  switch (collection) {
    case 'buses': {
      const kv = lastBus?.nominalKv;
      const cls = lastBus?.equipment?.class ?? classForKv(kv);
      return partial<BusInput>({
        id: uniqueId(ID_BASE.buses, taken),
        nominalKv: kv,
        ...(cls ? { equipment: { class: cls } } : {}),
      });
    }
    case 'sources':
      return variant === 'generator'
        ? partial({ id: uniqueId('GEN-1', taken), kind: 'generator', bus: firstBus })
        : partial({ id: uniqueId('UTIL-1', taken), kind: 'utility', bus: firstBus });
    case 'transformers':
      return partial({ id: uniqueId(ID_BASE.transformers, taken), fromBus: firstBus, toBus: '' });
    case 'cables':
      return partial({
        id: uniqueId(ID_BASE.cables, taken),
        fromBus: firstBus,
        toBus: '',
        sets: 1,
        material: 'Cu',
        conduit: 'steel',
      });
    case 'motors':
      return partial({ id: uniqueId(ID_BASE.motors, taken), bus: lastBus?.id ?? '' });
    case 'ties':
      return partial({ id: uniqueId(ID_BASE.ties, taken), fromBus: firstBus, toBus: '', closed: true });
    case 'devices':
      return partial<PlacedDeviceInput>({ id: uniqueId(ID_BASE.devices, taken), branch: '', end: 'from' });
  }
}

export function addElement(
  model: ModelInput,
  collection: CollectionKey,
  element: AnyElement,
): { model: ModelInput; index: number } {
  const items = [...itemsOf(model, collection), element] as ElementOf[typeof collection][];
  return { model: setItems(model, collection, items), index: items.length - 1 };
}

/** A copy of the element, with a free id, placed right after it. */
export function duplicateElement(
  model: ModelInput,
  collection: CollectionKey,
  index: number,
): { model: ModelInput; index: number } {
  const items = [...itemsOf(model, collection)] as AnyElement[];
  const original = items[index];
  if (!original) return { model, index };
  const copy = { ...structuredCloneSafe(original), id: uniqueId(original.id || ID_BASE[collection], allIds(model)) };
  items.splice(index + 1, 0, copy);
  return { model: setItems(model, collection, items as ElementOf[typeof collection][]), index: index + 1 };
}

/**
 * Removes an element. The operating scenarios' overrides of a deleted source, tie or motor go with it (unless another
 * element of that kind still has the id); references from other elements stay, so the checks show them.
 */
export function deleteElement(model: ModelInput, collection: CollectionKey, index: number): ModelInput {
  const element = itemsOf(model, collection)[index];
  const items = itemsOf(model, collection).filter((_, i) => i !== index) as ElementOf[typeof collection][];
  const next = setItems(model, collection, items);
  if (!element || items.some((e) => e.id === element.id)) return next;
  return removeFromScenarios(next, collection, element.id);
}

export function updateElement<C extends CollectionKey>(
  model: ModelInput,
  collection: C,
  index: number,
  update: (element: ElementOf[C]) => ElementOf[C],
): ModelInput {
  const items = itemsOf(model, collection);
  const current = items[index];
  if (current === undefined) return model;
  const next = update(current);
  if (next === current) return model;
  const copy = [...items];
  copy[index] = next;
  return setItems(model, collection, copy as ElementOf[C][]);
}

/**
 * Gives an element a new id. When the old id was used by this element only and the new one is free, every reference
 * follows (bus ids in sources, branches, motors; branch, source and motor ids in devices; source, tie and motor ids
 * in the operating scenarios' overrides).
 */
export function renameElement(model: ModelInput, collection: CollectionKey, index: number, newId: string): ModelInput {
  const element = itemsOf(model, collection)[index];
  if (!element || element.id === newId) return model;
  const oldId = element.id;
  let ownersOfOld = 0;
  let takenNew = false;
  for (const c of COLLECTIONS) {
    for (const e of itemsOf(model, c)) {
      if (e.id === oldId) ownersOfOld += 1;
      if (e.id === newId) takenNew = true;
    }
  }
  let next = updateElement(model, collection, index, (e) => ({ ...e, id: newId }));
  if (ownersOfOld !== 1 || takenNew || oldId === '' || newId === '') return next;
  const swap = (v: string | undefined) => (v === oldId ? newId : v);
  if (collection === 'buses') {
    next = {
      ...next,
      sources: next.sources?.map((s) => (s.bus === oldId ? { ...s, bus: newId } : s)),
      motors: next.motors?.map((m) => (m.bus === oldId ? { ...m, bus: newId } : m)),
      transformers: next.transformers?.map((t) =>
        t.fromBus === oldId || t.toBus === oldId ? { ...t, fromBus: swap(t.fromBus)!, toBus: swap(t.toBus)! } : t,
      ),
      cables: next.cables?.map((t) =>
        t.fromBus === oldId || t.toBus === oldId ? { ...t, fromBus: swap(t.fromBus)!, toBus: swap(t.toBus)! } : t,
      ),
      ties: next.ties?.map((t) =>
        t.fromBus === oldId || t.toBus === oldId ? { ...t, fromBus: swap(t.fromBus)!, toBus: swap(t.toBus)! } : t,
      ),
    };
  } else if (collection === 'transformers' || collection === 'cables' || collection === 'ties') {
    next = { ...next, devices: next.devices?.map((d) => (d.branch === oldId ? { ...d, branch: newId } : d)) };
  } else if (collection === 'sources' || collection === 'motors') {
    next = { ...next, devices: next.devices?.map((d) => (d.source === oldId ? { ...d, source: newId } : d)) };
  }
  return renameInScenarios(next, collection, oldId, newId);
}

/** How many elements refer to this id (to warn before a delete leaves references dangling). */
export function countReferences(model: ModelInput, id: string): number {
  if (!id) return 0;
  let n = 0;
  for (const s of model.sources ?? []) if (s.bus === id) n += 1;
  for (const m of model.motors ?? []) if (m.bus === id) n += 1;
  for (const b of [...(model.transformers ?? []), ...(model.cables ?? []), ...(model.ties ?? [])]) {
    if (b.fromBus === id) n += 1;
    if (b.toBus === id) n += 1;
  }
  for (const d of model.devices ?? []) if (d.branch === id || d.source === id) n += 1;
  return n;
}

/** Shifts the indexes of a set of element keys after an insert (+1 from `at`) or a delete (−1 after `at`, `at` removed). */
export function shiftKeys(
  keys: ReadonlySet<string>,
  collection: CollectionKey,
  at: number,
  change: 'insert' | 'delete',
): Set<string> {
  const out = new Set<string>();
  const prefix = `${collection}[`;
  for (const k of keys) {
    if (!k.startsWith(prefix)) {
      out.add(k);
      continue;
    }
    const i = Number(k.slice(prefix.length, -1));
    if (change === 'insert') out.add(`${prefix}${i >= at ? i + 1 : i}]`);
    else if (i !== at) out.add(`${prefix}${i > at ? i - 1 : i}]`);
  }
  return out;
}

function structuredCloneSafe<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}
