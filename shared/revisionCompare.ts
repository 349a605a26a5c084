import { formatCalPerCm2 } from './labelDisplay';
import { formatSig } from './numberFormat';
import type { BusChange, BusHazard, ElementChange, ModelElementKind, RevisionComparison } from './schemas/compare';
import type { BusResult } from './schemas/studyResults';

/**
 * The comparison of two revisions of a site's study (GET /studies/:id/compare/:otherId, the study overview and the
 * study report): the model's elements added, removed and changed field by field, and at every bus the change of the
 * hazard, largest rise first. Pure: it works on the models as stored (a draft's model may be incomplete) and on the
 * bus results of each revision's run.
 */

const COLLECTIONS = [
  'buses',
  'sources',
  'transformers',
  'cables',
  'motors',
  'ties',
  'devices',
  'scenarios',
] as const satisfies readonly ModelElementKind[];
/** Model-wide fields compared as the element "model". */
const MODEL_FIELDS = ['name', 'frequencyHz', 'prefaultPu'] as const;

type Value = string | number | boolean | null;
type Loose = Record<string, unknown>;

const isObject = (v: unknown): v is Loose => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A value as shown in a field change: a list, or an object inside a list, as compact JSON. */
function shown(v: unknown): Value {
  if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return v;
  return JSON.stringify(v) ?? null;
}

/** The element's fields as dotted paths (nested objects walked; lists kept whole), its id left out. */
function flatten(o: Loose, prefix = '', out = new Map<string, unknown>()): Map<string, unknown> {
  for (const [k, v] of Object.entries(o)) {
    if (prefix === '' && k === 'id') continue;
    if (v === undefined) continue;
    const path = prefix ? `${prefix}.${k}` : k;
    if (isObject(v) && Object.keys(v).length > 0) flatten(v, path, out);
    else out.set(path, v);
  }
  return out;
}

function fieldChanges(before: Loose, after: Loose): ElementChange['fields'] {
  const a = flatten(before);
  const b = flatten(after);
  const fields: ElementChange['fields'] = [];
  for (const path of [...new Set([...a.keys(), ...b.keys()])].sort()) {
    const x = a.has(path) ? shown(a.get(path)) : undefined;
    const y = b.has(path) ? shown(b.get(path)) : undefined;
    if (x === y) continue;
    fields.push({ field: path, ...(x !== undefined ? { before: x } : {}), ...(y !== undefined ? { after: y } : {}) });
  }
  return fields;
}

/** The elements of one collection by id (an element without a usable id is keyed by its position). */
function byId(items: unknown): Map<string, Loose> {
  const out = new Map<string, Loose>();
  if (!Array.isArray(items)) return out;
  items.forEach((item, i) => {
    if (!isObject(item)) return;
    const id = typeof item.id === 'string' && item.id.trim() ? item.id : `#${i + 1}`;
    if (!out.has(id)) out.set(id, item);
  });
  return out;
}

const nameOf = (e: Loose | undefined): string | null => (typeof e?.name === 'string' && e.name ? e.name : null);

/** Elements added, removed and changed from `before` to `after` (models as stored; either may be incomplete). */
export function compareModels(before: unknown, after: unknown): ElementChange[] {
  const a = isObject(before) ? before : {};
  const b = isObject(after) ? after : {};
  const out: ElementChange[] = [];
  const modelWide = fieldChanges(
    Object.fromEntries(MODEL_FIELDS.filter((f) => a[f] !== undefined).map((f) => [f, a[f]])),
    Object.fromEntries(MODEL_FIELDS.filter((f) => b[f] !== undefined).map((f) => [f, b[f]])),
  );
  if (modelWide.length) out.push({ kind: 'model', id: 'model', name: null, change: 'changed', fields: modelWide });
  for (const kind of COLLECTIONS) {
    const x = byId(a[kind]);
    const y = byId(b[kind]);
    for (const [id, e] of y) {
      const old = x.get(id);
      if (!old) {
        out.push({ kind, id, name: nameOf(e), change: 'added', fields: [] });
        continue;
      }
      const fields = fieldChanges(old, e);
      if (fields.length) out.push({ kind, id, name: nameOf(e) ?? nameOf(old), change: 'changed', fields });
    }
    for (const [id, e] of x) {
      if (!y.has(id)) out.push({ kind, id, name: nameOf(e), change: 'removed', fields: [] });
    }
  }
  return out;
}

function hazardOf(b: BusResult): BusHazard {
  const ok = b.status === 'ok';
  return {
    status: b.status,
    incidentEnergyCalPerCm2: ok ? (b.incidentEnergyCalPerCm2 ?? null) : null,
    arcFlashBoundaryMm: ok ? (b.arcFlashBoundaryMm ?? null) : null,
    ppeLevel: ok ? (b.labelValues?.ppeLevel?.name ?? null) : null,
    signalWord: ok ? (b.labelValues?.signalWord ?? null) : null,
    clearingDeviceId: ok ? (b.clearingDeviceId ?? null) : null,
    scenarioId: b.scenarioId ?? null,
  };
}

/** Equal within floating-point noise (relative 1e-9), or both missing. */
function same(a: number | null, b: number | null): boolean {
  if (a === null || b === null) return a === b;
  return Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
}

/** Sort key: a bus failing in the newer revision first (its hazard is unknown), then the largest rise. */
function riseKey(c: BusChange): number {
  if (c.after?.status === 'error') return Number.POSITIVE_INFINITY;
  return c.energyRiseCalPerCm2 ?? Number.NEGATIVE_INFINITY;
}

/** Bus by bus, the change of the hazard from the baseline's results to the newer revision's, largest rise first. */
export function compareBusResults(before: BusResult[], after: BusResult[]): BusChange[] {
  const x = new Map(before.map((b) => [b.busId, b]));
  const y = new Map(after.map((b) => [b.busId, b]));
  const ids = [...y.keys(), ...[...x.keys()].filter((id) => !y.has(id))];
  const out = ids.map((busId): BusChange => {
    const old = x.get(busId);
    const now = y.get(busId);
    const h0 = old ? hazardOf(old) : null;
    const h1 = now ? hazardOf(now) : null;
    const e0 = h0 ? h0.incidentEnergyCalPerCm2 : 0;
    const e1 = h1 ? h1.incidentEnergyCalPerCm2 : 0;
    // A difference at the level of floating-point noise (a re-ordered network) is no change.
    const rise = e0 === null || e1 === null ? null : same(e0, e1) ? 0 : e1 - e0;
    const ppeLevelChanged = (h0?.ppeLevel ?? null) !== (h1?.ppeLevel ?? null);
    const signalWordChanged = (h0?.signalWord ?? null) !== (h1?.signalWord ?? null);
    const unchanged =
      h0 !== null &&
      h1 !== null &&
      h0.status === h1.status &&
      rise === 0 &&
      same(h0.arcFlashBoundaryMm, h1.arcFlashBoundaryMm) &&
      !ppeLevelChanged &&
      !signalWordChanged;
    return {
      busId,
      busName: now?.busName ?? old?.busName ?? busId,
      change: !h0 ? 'added' : !h1 ? 'removed' : unchanged ? 'unchanged' : 'changed',
      before: h0,
      after: h1,
      energyRiseCalPerCm2: rise,
      energyRisePct: rise !== null && e0 !== null && e0 > 0 && h0 && h1 ? (100 * rise) / e0 : null,
      ppeLevelChanged,
      signalWordChanged,
    };
  });
  return out.sort((p, q) => riseKey(q) - riseKey(p) || p.busId.localeCompare(q.busId));
}

// ---------------------------------------------------------------------------------------------
// The words of a comparison, one copy for the screen and the study report.

const KIND_WORDS: Record<ModelElementKind, string> = {
  model: 'Model',
  buses: 'Bus',
  sources: 'Source',
  transformers: 'Transformer',
  cables: 'Cable',
  motors: 'Motor',
  ties: 'Tie',
  devices: 'Device',
  scenarios: 'Scenario',
};

/** "Device R-TX2 (TX-2 primary relay) changed", "Bus NEW-PNL added". */
export function elementHeading(e: ElementChange): string {
  const name = e.name && e.name !== e.id ? ` (${e.name})` : '';
  return e.kind === 'model' ? 'Model settings changed' : `${KIND_WORDS[e.kind]} ${e.id}${name} ${e.change}`;
}

const fieldValueText = (v: string | number | boolean | null | undefined) =>
  v === undefined ? 'not set' : v === null ? 'none' : typeof v === 'string' ? v : String(v);

/** "device.timeDial: 2 → 6". */
export function fieldChangeText(f: ElementChange['fields'][number]): string {
  return `${f.field}: ${fieldValueText(f.before)} → ${fieldValueText(f.after)}`;
}

/** A revision's energy at a bus as printed: "4.8 cal/cm²", "error", or "—" (no such bus). */
export function hazardEnergyText(h: BusHazard | null): string {
  if (!h) return '—';
  if (h.status === 'error' || h.incidentEnergyCalPerCm2 === null) return 'error';
  return `${formatCalPerCm2(h.incidentEnergyCalPerCm2)} cal/cm²`;
}

/** The change of energy in words: "+2.31 cal/cm² (+48 %)", "new bus", "removed", "no change", "unknown (…)". */
export function riseText(c: BusChange): string {
  if (c.after?.status === 'error') return 'unknown: the newer revision fails at this bus';
  if (c.before?.status === 'error') return 'unknown: the earlier revision failed at this bus';
  if (c.change === 'added') return 'new bus';
  if (c.change === 'removed') return 'no longer labelled';
  const rise = c.energyRiseCalPerCm2 ?? 0;
  if (rise === 0) return 'no change';
  const sign = rise > 0 ? '+' : '−';
  const pct = c.energyRisePct === null ? '' : ` (${sign}${formatSig(Math.abs(c.energyRisePct), 2)} %)`;
  return `${sign}${formatSig(Math.abs(rise), 3)} cal/cm²${pct}`;
}

/** PPE level and signal word changes in words, e.g. ["PPE level 1 → PPE level 2", "WARNING → DANGER"]. */
export function labelChangeTexts(c: BusChange): string[] {
  const out: string[] = [];
  const ppe = (h: BusHazard | null) =>
    !h ? 'not labelled' : h.status === 'error' ? 'unknown' : (h.ppeLevel ?? 'no PPE level adequate');
  if (c.ppeLevelChanged) out.push(`${ppe(c.before)} → ${ppe(c.after)}`);
  const word = (h: BusHazard | null) => (!h ? 'not labelled' : (h.signalWord ?? 'unknown'));
  if (c.signalWordChanged) out.push(`${word(c.before)} → ${word(c.after)}`);
  return out;
}

/** One line over a whole comparison: "1 model change · 1 bus higher, 0 lower · PPE level changed at 0 buses". */
export function comparisonSummary(c: RevisionComparison): string {
  const n = (k: number, one: string, many: string) => `${k} ${k === 1 ? one : many}`;
  const changes = c.model.counts.added + c.model.counts.removed + c.model.counts.changed;
  const parts = [n(changes, 'model change', 'model changes')];
  if (c.buses.length) {
    parts.push(`${n(c.counts.higher, 'bus', 'buses')} higher, ${c.counts.lower} lower`);
    parts.push(`PPE level changed at ${n(c.counts.ppeLevelChanged, 'bus', 'buses')}`);
    if (c.counts.signalWordChanged)
      parts.push(`signal word changed at ${n(c.counts.signalWordChanged, 'bus', 'buses')}`);
  }
  return parts.join(' · ');
}
