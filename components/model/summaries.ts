/**
 * Pure helpers of the model editor: element types, one-line summaries, and the mapping of a `ModelIssue` path
 * (e.g. `cables[2].toBus`) to the element and field it concerns. No React here, so all of it can be unit-tested.
 */
import { deviceSettingParts } from '../../shared/deviceSummary';
import { findEquipmentClass } from '../../shared/equipmentClasses';
import { formatSig, MISSING } from '../../shared/numberFormat';
import { lengthReading, type UnitSystem } from '../../hooks/units';
import type { Device } from '../../shared/schemas/device';
import { DEVICE_KIND_LABELS } from '../../shared/schemas/deviceLibrary';
import { normalizeConductorSize, type ModelInput, type ModelIssue } from '../../shared/schemas/model';

// ---------------------------------------------------------------------------------------------
// Element types (the editor works on the model as typed, before zod defaults are applied)

export type BusInput = ModelInput['buses'][number];
export type EquipmentInput = NonNullable<BusInput['equipment']>;
export type SourceInput = NonNullable<ModelInput['sources']>[number];
export type UtilityInput = Extract<SourceInput, { kind: 'utility' }>;
export type GeneratorInput = Extract<SourceInput, { kind: 'generator' }>;
export type TransformerInput = NonNullable<ModelInput['transformers']>[number];
export type CableInput = NonNullable<ModelInput['cables']>[number];
export type MotorInput = NonNullable<ModelInput['motors']>[number];
export type TieInput = NonNullable<ModelInput['ties']>[number];
export type PlacedDeviceInput = NonNullable<ModelInput['devices']>[number];

export const COLLECTIONS = ['buses', 'sources', 'transformers', 'cables', 'motors', 'ties', 'devices'] as const;
export type CollectionKey = (typeof COLLECTIONS)[number];

export interface ElementOf {
  buses: BusInput;
  sources: SourceInput;
  transformers: TransformerInput;
  cables: CableInput;
  motors: MotorInput;
  ties: TieInput;
  devices: PlacedDeviceInput;
}
export type AnyElement = ElementOf[CollectionKey];

/**
 * What a `ModelIssue` path may name: the element collections and the operating scenarios (which are not elements:
 * their ids are their own, and nothing refers to them).
 */
export type IssueCollection = CollectionKey | 'scenarios';

export const COLLECTION_LABELS: Record<IssueCollection, { plural: string; singular: string }> = {
  buses: { plural: 'Buses', singular: 'bus' },
  sources: { plural: 'Sources', singular: 'source' },
  transformers: { plural: 'Transformers', singular: 'transformer' },
  cables: { plural: 'Cables', singular: 'cable' },
  motors: { plural: 'Motors', singular: 'motor' },
  ties: { plural: 'Ties', singular: 'tie' },
  devices: { plural: 'Devices', singular: 'device' },
  scenarios: { plural: 'Scenarios', singular: 'scenario' },
};

export function isCollection(name: string): name is CollectionKey {
  return (COLLECTIONS as readonly string[]).includes(name);
}

export function isIssueCollection(name: string): name is IssueCollection {
  return name === 'scenarios' || isCollection(name);
}

/** The elements of one collection (an absent optional collection is empty). */
export function itemsOf<C extends CollectionKey>(model: ModelInput, collection: C): readonly ElementOf[C][] {
  return ((model[collection] as ElementOf[C][] | undefined) ?? []) as readonly ElementOf[C][];
}

// ---------------------------------------------------------------------------------------------
// Numbers and names

/** `base` when free; else its trailing number counted up ("TX-1" → "TX-2"), or "-2", "-3"… appended. */
export function uniqueId(base: string, taken: ReadonlySet<string>): string {
  if (!taken.has(base)) return base;
  const m = /^(.*?)(\d+)$/.exec(base);
  if (m) {
    const [, stem, digits] = m;
    for (let n = Number(digits) + 1; ; n += 1) {
      const candidate = `${stem}${String(n).padStart(digits.length, '0')}`;
      if (!taken.has(candidate)) return candidate;
    }
  }
  for (let n = 2; ; n += 1) {
    const candidate = `${base}-${n}`;
    if (!taken.has(candidate)) return candidate;
  }
}

/** A number as typed by an engineer: up to 6 significant figures, no trailing zeros; "—" when missing. */
export function num(value: number | undefined | null): string {
  if (value === undefined || value === null) return MISSING;
  return formatSig(value, 6);
}

const AWG_SIZES = new Set(['14', '12', '10', '8', '6', '4', '3', '2', '1', '1/0', '2/0', '3/0', '4/0']);

/** "500 kcmil", "4/0 AWG"; the text as given when it is not a size of NEC Chapter 9 Table 9. */
export function conductorSizeLabel(size: string | undefined): string {
  if (size === undefined || size.trim() === '') return '—';
  const canonical = normalizeConductorSize(size);
  if (canonical === null) return size;
  return AWG_SIZES.has(canonical) ? `${canonical} AWG` : `${canonical} kcmil`;
}

/** The value the editor stores for a canonical size: "500kcmil" or "4/0" (both read back by the schema). */
export function conductorSizeValue(canonical: string): string {
  return AWG_SIZES.has(canonical) ? canonical : `${canonical}kcmil`;
}

export const CONDUIT_LABELS: Record<string, string> = { steel: 'Steel', pvc: 'PVC', aluminum: 'Aluminum' };

// ---------------------------------------------------------------------------------------------
// One-line summaries

/** An equipment class label short enough for a table cell or a summary line: "LV MCC/panel (deep)". */
export function shortClassLabel(label: string): string {
  return label.replace('Low-voltage', 'LV').replace('motor control centre', 'MCC').replace(' or panelboard', '/panel');
}

export function busSummary(b: BusInput): string {
  const parts = [`${num(b.nominalKv)} kV`];
  const eq = b.equipment;
  if (!eq) parts.push('no equipment');
  else {
    const cls = findEquipmentClass(eq.class);
    parts.push(cls ? shortClassLabel(cls.label) : `class "${eq.class}"`);
    const overrides = (['electrodeConfig', 'gapMm', 'workingDistanceMm', 'enclosureMm'] as const).filter(
      (k) => eq[k] !== undefined,
    ).length;
    if (overrides) parts.push(`${overrides} override${overrides === 1 ? '' : 's'}`);
    if (eq.mainIsolated === false) parts.push('main not isolated');
    else if (eq.mainIsolated === true) parts.push('main isolated');
  }
  return parts.join(' · ');
}

export function sourceSummary(s: SourceInput): string {
  if (s.kind === 'utility') {
    const sc =
      s.shortCircuitMva !== undefined
        ? `${num(s.shortCircuitMva)} MVA`
        : s.shortCircuitKa !== undefined
          ? `${num(s.shortCircuitKa)} kA`
          : 'short circuit —';
    return `Utility at ${s.bus || '—'} · ${sc} · X/R ${num(s.xr)}`;
  }
  return `Generator at ${s.bus || '—'} · ${num(s.kva)} kVA · ${num(s.kv)} kV · X″d ${num(s.subtransientPct)} % · X/R ${num(s.xr)}`;
}

export function transformerSummary(t: TransformerInput): string {
  return `${t.fromBus || '—'} → ${t.toBus || '—'} · ${num(t.kva)} kVA · ${num(t.primaryKv)}/${num(t.secondaryKv)} kV · ${num(t.impedancePct)} %Z`;
}

export function cableConductors(c: CableInput): string {
  const sets = c.sets ?? 1;
  if (c.rOhmPerKm !== undefined || c.xOhmPerKm !== undefined) {
    return `${sets} × R ${num(c.rOhmPerKm)}, X ${num(c.xOhmPerKm)} Ω/km`;
  }
  const conduit = c.conduit ? (CONDUIT_LABELS[c.conduit] ?? c.conduit).toLowerCase() : '—';
  return `${sets} × ${conductorSizeLabel(c.size)} ${c.material ?? '—'}, ${conduit} conduit`;
}

export function cableSummary(c: CableInput, system: UnitSystem = 'si'): string {
  return `${c.fromBus || '—'} → ${c.toBus || '—'} · ${lengthReading(c.lengthM, 'm', system)} · ${cableConductors(c)}`;
}

export function motorSummary(m: MotorInput): string {
  const rating = m.hp !== undefined ? `${num(m.hp)} hp` : m.kva !== undefined ? `${num(m.kva)} kVA` : 'rating —';
  return `At ${m.bus || '—'} · ${rating} · ${num(m.kv)} kV`;
}

export function tieSummary(t: TieInput): string {
  return `${t.fromBus || '—'} — ${t.toBus || '—'} · ${t.closed === false ? 'open' : 'closed'}`;
}

/** What a protective device is, in one line: its settings (the words of the study report, shared/deviceSummary.ts). */
export function deviceSettingsSummary(d: Device | undefined): string {
  return d ? deviceSettingParts(d).join(' · ') : 'No device chosen';
}

export function deviceKindLabel(d: Device | undefined): string {
  return d ? DEVICE_KIND_LABELS[d.kind] : '—';
}

/** Where a placed device sits: "TX-1, to end" or "on UTIL-1". */
export function deviceLocation(d: PlacedDeviceInput): string {
  if (d.branch !== undefined) return `${d.branch || '—'}${d.end ? `, ${d.end} end` : ''}`;
  if (d.source !== undefined) return `on ${d.source || '—'}`;
  return 'not placed';
}

export function placedDeviceSummary(d: PlacedDeviceInput): string {
  const what = d.library?.name ?? deviceKindLabel(d.device as Device | undefined);
  return `${deviceLocation(d)} · ${what}`;
}

/** One line about an element; lengths in the user's unit system (`system`, SI by default). */
export function elementSummary(collection: CollectionKey, element: AnyElement, system: UnitSystem = 'si'): string {
  switch (collection) {
    case 'buses':
      return busSummary(element as BusInput);
    case 'sources':
      return sourceSummary(element as SourceInput);
    case 'transformers':
      return transformerSummary(element as TransformerInput);
    case 'cables':
      return cableSummary(element as CableInput, system);
    case 'motors':
      return motorSummary(element as MotorInput);
    case 'ties':
      return tieSummary(element as TieInput);
    case 'devices':
      return placedDeviceSummary(element as PlacedDeviceInput);
  }
}

/** Lower-case text an element is found by in the section filter: id, name and summary. */
export function searchText(collection: CollectionKey, element: AnyElement): string {
  return `${element.id} ${element.name ?? ''} ${elementSummary(collection, element)}`.toLowerCase();
}

// ---------------------------------------------------------------------------------------------
// Issues: path → element and field

export interface IssuePath {
  /** The collection, when the path names one (`cables[2].toBus`, or `buses` alone). */
  collection?: IssueCollection;
  /** Index in that collection, when the path names an element. */
  index?: number;
  /** The field inside the element (`toBus`, `equipment.enclosureMm.height`), or the model field (`frequencyHz`). */
  field?: string;
}

/** `cables[2].toBus` → `{ collection: 'cables', index: 2, field: 'toBus' }`; `frequencyHz` → `{ field: 'frequencyHz' }`. */
export function parseIssuePath(path: string): IssuePath {
  const m = /^([A-Za-z]+)(?:\[(\d+)\])?(.*)$/.exec(path.trim());
  if (!m) return {};
  const [, head, index, rest] = m;
  if (!isIssueCollection(head)) return { field: path.trim() || undefined };
  const field = rest.replace(/^\./, '');
  return {
    collection: head,
    ...(index !== undefined ? { index: Number(index) } : {}),
    ...(field ? { field } : {}),
  };
}

export interface LocatedIssue {
  issue: ModelIssue;
  collection?: IssueCollection;
  index?: number;
  field?: string;
  /** `cables[2]`, the key of the element in the editor; undefined for issues of the whole model. */
  key?: string;
}

export const elementKey = (collection: IssueCollection, index: number) => `${collection}[${index}]`;

/** The items of a collection or the scenarios, each with its id, for finding an issue's element. */
function issueItems(model: ModelInput, collection: IssueCollection): readonly { id?: unknown }[] {
  return collection === 'scenarios'
    ? (model.scenarios ?? [])
    : (itemsOf(model, collection) as readonly { id?: unknown }[]);
}

/**
 * Where an issue belongs in the model. The index of its path is trusted when the element there has the issue's
 * element id (or the issue names none); otherwise (the model changed since it was checked) the element is found by id.
 */
export function locateIssue(issue: ModelIssue, model: ModelInput | undefined): LocatedIssue {
  const p = parseIssuePath(issue.path);
  if (!p.collection || p.index === undefined) {
    return { issue, collection: p.collection, field: p.field ?? issue.field };
  }
  let index: number | undefined = p.index;
  if (model && issue.elementId !== undefined) {
    const items = issueItems(model, p.collection);
    if (items[index]?.id !== issue.elementId) {
      const found = items.findIndex((e) => e?.id === issue.elementId);
      index = found >= 0 ? found : index < items.length ? index : undefined;
    }
  }
  if (index === undefined) return { issue, collection: p.collection, field: p.field };
  return { issue, collection: p.collection, index, field: p.field, key: elementKey(p.collection, index) };
}

export interface GroupedIssues {
  all: LocatedIssue[];
  /** By element key (`cables[2]`). */
  byElement: Map<string, LocatedIssue[]>;
  /** Count by collection (including issues of the collection as a whole). */
  byCollection: Record<IssueCollection, number>;
  /** Issues of the whole model or of a collection as a whole (`buses`: "Give at least one bus"). */
  general: LocatedIssue[];
}

export function groupIssues(issues: readonly ModelIssue[], model: ModelInput | undefined): GroupedIssues {
  const byElement = new Map<string, LocatedIssue[]>();
  const byCollection = Object.fromEntries([...COLLECTIONS, 'scenarios'].map((c) => [c, 0])) as Record<
    IssueCollection,
    number
  >;
  const general: LocatedIssue[] = [];
  const all = issues.map((i) => locateIssue(i, model));
  for (const li of all) {
    if (li.collection) byCollection[li.collection] += 1;
    if (li.key) {
      const list = byElement.get(li.key);
      if (list) list.push(li);
      else byElement.set(li.key, [li]);
    } else general.push(li);
  }
  return { all, byElement, byCollection, general };
}

/** True when an issue's field falls under an editor field key: `equipment.enclosureMm.height` under `equipment.enclosureMm`. */
export function fieldCovers(key: string, field: string | undefined): boolean {
  if (field === undefined) return false;
  return field === key || field.startsWith(`${key}.`) || field.startsWith(`${key}[`);
}

/**
 * The editor field (of `fields`, each with the issue field keys it shows) that an issue belongs to: the one with
 * the most specific matching key. -1 when none does (the issue is shown on the element as a whole).
 */
export function matchField(field: string | undefined, fields: readonly { issueKeys: readonly string[] }[]): number {
  let best = -1;
  let bestLength = -1;
  fields.forEach((f, i) => {
    for (const key of f.issueKeys) {
      if (fieldCovers(key, field) && key.length > bestLength) {
        best = i;
        bestLength = key.length;
      }
    }
  });
  return best;
}

const FIELD_LABELS: Record<string, string> = {
  id: 'Id',
  name: 'Name',
  format: 'Format',
  version: 'Version',
  frequencyHz: 'Frequency',
  prefaultPu: 'Pre-fault voltage',
  nominalKv: 'Nominal voltage',
  equipment: 'Equipment',
  'equipment.class': 'Equipment class',
  'equipment.electrodeConfig': 'Electrode configuration',
  'equipment.gapMm': 'Gap',
  'equipment.workingDistanceMm': 'Working distance',
  'equipment.enclosureMm': 'Enclosure',
  'equipment.enclosureMm.height': 'Enclosure height',
  'equipment.enclosureMm.width': 'Enclosure width',
  'equipment.enclosureMm.depth': 'Enclosure depth',
  'equipment.mainIsolated': 'Main isolated',
  kind: 'Kind',
  bus: 'Bus',
  shortCircuitMva: 'Short circuit',
  shortCircuitKa: 'Short circuit',
  xr: 'X/R',
  kva: 'kVA',
  kv: 'Rated voltage',
  subtransientPct: 'Subtransient reactance',
  fromBus: 'From bus',
  toBus: 'To bus',
  primaryKv: 'Primary voltage',
  secondaryKv: 'Secondary voltage',
  impedancePct: 'Impedance',
  lengthM: 'Length',
  sets: 'Sets',
  size: 'Size',
  material: 'Material',
  conduit: 'Conduit',
  rOhmPerKm: 'R',
  xOhmPerKm: 'X',
  hp: 'Rating',
  lockedRotorMultiple: 'Locked-rotor current',
  firstCycleMultiplier: 'First-cycle multiplier',
  rpm: 'Speed',
  closed: 'State',
  branch: 'Location',
  source: 'Location',
  end: 'End',
  device: 'Device',
  library: 'Device type',
};

/** A field path in words: `equipment.gapMm` → "Gap"; unknown deeper paths fall back to their nearest known parent. */
export function fieldLabel(field: string | undefined): string {
  if (!field) return '';
  let f = field;
  for (;;) {
    if (FIELD_LABELS[f])
      return f === field ? FIELD_LABELS[f] : `${FIELD_LABELS[f]} (${field.slice(f.length).replace(/^\./, '')})`;
    const cut = Math.max(f.lastIndexOf('.'), f.lastIndexOf('['));
    if (cut <= 0) return field;
    f = f.slice(0, cut);
  }
}

/** The label of a scenario's issue field: `sources.GEN-1.shortCircuitMva` → "GEN-1 · Short circuit". */
export function scenarioFieldLabel(field: string | undefined): string {
  if (!field) return '';
  const m = /^(sources|ties|motors)\.(.+?)(?:\.(inService|shortCircuitMva|shortCircuitKa|xr|closed))?$/.exec(field);
  if (!m) {
    const plain: Record<string, string> = {
      id: 'Id',
      name: 'Name',
      sources: 'Sources',
      ties: 'Ties',
      motors: 'Motors',
      allMotorsOff: 'All motors stopped',
    };
    return plain[field] ?? field;
  }
  const [, , id, sub] = m;
  const subLabel: Record<string, string> = {
    inService: 'In service',
    shortCircuitMva: 'Short circuit',
    shortCircuitKa: 'Short circuit',
    xr: 'X/R',
    closed: 'State',
  };
  return sub ? `${id} · ${subLabel[sub]}` : id;
}

/** Where an issue of a scenario belongs: the element it names and the field (`undefined`: the scenario as a whole). */
export function scenarioIssueTarget(
  field: string | undefined,
): { kind: 'sources' | 'ties' | 'motors'; id: string; sub?: string } | { field?: string } {
  const m = field
    ? /^(sources|ties|motors)\.(.+?)(?:\.(inService|shortCircuitMva|shortCircuitKa|xr|closed))?$/.exec(field)
    : null;
  if (!m) return { field };
  return { kind: m[1] as 'sources' | 'ties' | 'motors', id: m[2], ...(m[3] ? { sub: m[3] } : {}) };
}

/** "Cables · FDR-3 · To bus" — where an issue is, in words. */
export function issuePlace(li: LocatedIssue, model: ModelInput | undefined): string {
  const parts: string[] = [];
  if (li.collection) parts.push(COLLECTION_LABELS[li.collection].plural);
  if (li.collection && li.index !== undefined) {
    const id = li.issue.elementId ?? (model ? issueItems(model, li.collection)[li.index]?.id : undefined);
    parts.push(typeof id === 'string' && id ? id : `#${li.index + 1}`);
  }
  if (li.field) parts.push(li.collection === 'scenarios' ? scenarioFieldLabel(li.field) : fieldLabel(li.field));
  return parts.join(' · ') || 'Model';
}

/** "3 problems" / "1 problem". */
export function problemCount(n: number): string {
  return `${n} problem${n === 1 ? '' : 's'}`;
}

/** Zod's wording for a missing number, in plainer terms for the engineer. */
export function issueMessage(issue: ModelIssue): string {
  const m = issue.message;
  if (m === 'Give an id') {
    const field = issue.field ?? parseIssuePath(issue.path).field;
    if (field === 'bus' || field === 'fromBus' || field === 'toBus') return 'Choose a bus';
    if (field === 'branch' || field === 'source') return 'Choose where the device sits';
  }
  const generatorFault = /^shortCircuit(?:Mva|Ka) applies to a utility source; "(.*)" is a generator$/.exec(m);
  if (generatorFault) {
    return `A fault level applies to a utility only: generator "${generatorFault[1]}" feeds the fault from its rating and reactances`;
  }
  if (/received undefined/i.test(m)) return 'Required';
  if (/expected number, received NaN/i.test(m)) return 'Enter a number';
  return m;
}
