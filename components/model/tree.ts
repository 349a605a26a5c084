/**
 * The system as a tree, from each source down: source → its bus → buses fed through transformers, cables and
 * closed ties → … Pure, so it can be unit-tested. Buses are placed once, at their first (breadth-first) reach from
 * the sources in model order; any other path to a bus becomes an "also fed from" note. Buses no source reaches are
 * listed as islands, and elements whose buses are unknown as unconnected.
 */
import type { ModelInput } from '../../shared/schemas/model';
import { lengthReading, type UnitSystem } from '../../hooks/units';
import {
  cableConductors,
  num,
  type CableInput,
  type CollectionKey,
  type PlacedDeviceInput,
  type SourceInput,
  type TieInput,
  type TransformerInput,
} from './summaries';

export interface ElementRef {
  collection: CollectionKey;
  index: number;
}

export interface DeviceMarker extends ElementRef {
  id: string;
  /** For a device on a branch: the end it sits at. */
  end?: 'from' | 'to';
}

export type BranchCollection = 'transformers' | 'cables' | 'ties';

export interface ViaBranch extends ElementRef {
  collection: BranchCollection;
  id: string;
  text: string;
  /** Devices at the end toward the feeding bus (line side), then at the far end (load side). */
  lineSide: DeviceMarker[];
  loadSide: DeviceMarker[];
}

interface RowBase {
  key: string;
  depth: number;
  /** Filled by `flattenTree`: for each ancestor level, whether its vertical connector continues; and whether this row is its parent's last child. */
  guides: boolean[];
  last: boolean;
  hasChildren: boolean;
}

export type TreeRow =
  | (RowBase & { kind: 'heading'; text: string })
  | (RowBase & {
      kind: 'source';
      ref: ElementRef;
      id: string;
      label: string;
      text: string;
      devices: DeviceMarker[];
      note?: string;
    })
  | (RowBase & {
      kind: 'bus';
      ref: ElementRef;
      id: string;
      name?: string;
      kv: string;
      via?: ViaBranch;
      notes: string[];
    })
  | (RowBase & { kind: 'seen-bus'; id: string; ref?: ElementRef; text: string })
  | (RowBase & { kind: 'motor'; ref: ElementRef; id: string; text: string; devices: DeviceMarker[] })
  | (RowBase & { kind: 'open-tie'; ref: ElementRef; id: string; text: string; devices: DeviceMarker[] })
  | (RowBase & { kind: 'unconnected'; ref: ElementRef; id: string; text: string });

/** A row before its place in the tree is known. */
type RowData = TreeRow extends infer R
  ? R extends TreeRow
    ? Omit<R, 'guides' | 'last' | 'hasChildren' | 'depth'>
    : never
  : never;

interface Node {
  row: RowData;
  children: Node[];
}

interface Edge {
  collection: BranchCollection;
  index: number;
  id: string;
  fromBus: string;
  toBus: string;
  text: string;
}

function branchText(
  collection: BranchCollection,
  b: TransformerInput | CableInput | TieInput,
  system: UnitSystem,
): string {
  if (collection === 'transformers') {
    const t = b as TransformerInput;
    return `${num(t.kva)} kVA · ${num(t.primaryKv)}/${num(t.secondaryKv)} kV · ${num(t.impedancePct)} %Z`;
  }
  if (collection === 'cables') {
    const c = b as CableInput;
    return `${lengthReading(c.lengthM, 'm', system)} · ${cableConductors(c)}`;
  }
  return 'closed tie';
}

function sourceText(s: SourceInput): string {
  if (s.kind === 'utility') {
    const sc =
      s.shortCircuitMva !== undefined
        ? `${num(s.shortCircuitMva)} MVA`
        : s.shortCircuitKa !== undefined
          ? `${num(s.shortCircuitKa)} kA`
          : '—';
    return `Utility · ${sc} · X/R ${num(s.xr)}`;
  }
  return `Generator · ${num(s.kva)} kVA · X″d ${num(s.subtransientPct)} %`;
}

/** Builds the tree and returns it as rows in display order, with connector guides; lengths in `system`. */
export function buildSystemTree(model: ModelInput, system: UnitSystem = 'si'): TreeRow[] {
  const buses = model.buses ?? [];
  const sources = model.sources ?? [];
  const motors = model.motors ?? [];
  const ties = model.ties ?? [];
  const devices = (model.devices ?? []) as PlacedDeviceInput[];

  const busIndex = new Map<string, number>();
  buses.forEach((b, i) => {
    if (!busIndex.has(b.id)) busIndex.set(b.id, i);
  });

  // Devices by the element they sit on.
  const devicesOn = new Map<string, DeviceMarker[]>();
  devices.forEach((d, i) => {
    const on = d.branch ?? d.source;
    if (!on) return;
    const marker: DeviceMarker = {
      collection: 'devices',
      index: i,
      id: d.id,
      ...(d.branch !== undefined && d.end ? { end: d.end } : {}),
    };
    const list = devicesOn.get(on);
    if (list) list.push(marker);
    else devicesOn.set(on, [marker]);
  });
  const markers = (id: string) => devicesOn.get(id) ?? [];

  // Branches that join two known buses; the rest are unconnected.
  const edges: Edge[] = [];
  const unconnected: Node[] = [];
  const openTies: Edge[] = [];
  const addBranches = (collection: BranchCollection, items: readonly (TransformerInput | CableInput | TieInput)[]) =>
    items.forEach((b, index) => {
      const e: Edge = {
        collection,
        index,
        id: b.id,
        fromBus: b.fromBus,
        toBus: b.toBus,
        text: branchText(collection, b, system),
      };
      if (!busIndex.has(b.fromBus) || !busIndex.has(b.toBus)) {
        const missing = [b.fromBus, b.toBus].filter((x) => !busIndex.has(x)).map((x) => (x ? `"${x}"` : '(none)'));
        unconnected.push({
          row: {
            kind: 'unconnected',
            key: `${collection}[${index}]`,
            ref: { collection, index },
            id: b.id,
            text: `unknown bus ${missing.join(' and ')}`,
          },
          children: [],
        });
        return;
      }
      if (collection === 'ties' && (b as TieInput).closed === false) openTies.push(e);
      else edges.push(e);
    });
  addBranches('transformers', model.transformers ?? []);
  addBranches('cables', model.cables ?? []);
  addBranches('ties', ties);

  const adjacency = new Map<string, Edge[]>();
  for (const e of edges) {
    for (const b of [e.fromBus, e.toBus]) {
      const list = adjacency.get(b);
      if (list) list.push(e);
      else adjacency.set(b, [e]);
    }
  }
  const openTiesAt = new Map<string, Edge[]>();
  for (const e of openTies) {
    for (const b of [e.fromBus, e.toBus]) {
      const list = openTiesAt.get(b);
      if (list) list.push(e);
      else openTiesAt.set(b, [e]);
    }
  }
  const motorsAt = new Map<string, number[]>();
  motors.forEach((m, i) => {
    if (!busIndex.has(m.bus)) {
      unconnected.push({
        row: {
          kind: 'unconnected',
          key: `motors[${i}]`,
          ref: { collection: 'motors', index: i },
          id: m.id,
          text: `unknown bus ${m.bus ? `"${m.bus}"` : '(none)'}`,
        },
        children: [],
      });
      return;
    }
    const list = motorsAt.get(m.bus);
    if (list) list.push(i);
    else motorsAt.set(m.bus, [i]);
  });

  const placed = new Map<string, string>(); // bus id → where it is shown (the source or island root it hangs under)
  const usedEdges = new Set<Edge>();
  const busNodes = new Map<string, Node>();

  const busNode = (busId: string, via?: ViaBranch): Node => {
    const i = busIndex.get(busId)!;
    const b = buses[i];
    const node: Node = {
      row: {
        kind: 'bus',
        key: `buses[${i}]`,
        ref: { collection: 'buses', index: i },
        id: b.id,
        name: b.name,
        kv: `${num(b.nominalKv)} kV`,
        via,
        notes: [],
      },
      children: [],
    };
    busNodes.set(busId, node);
    return node;
  };
  const addNote = (busId: string, note: string) => {
    const n = busNodes.get(busId);
    if (n && n.row.kind === 'bus') n.row.notes.push(note);
  };

  /** Breadth-first from a root bus; returns the root node with its subtree. */
  const grow = (rootBus: string, owner: string): Node => {
    const root = busNode(rootBus);
    placed.set(rootBus, owner);
    const queue: string[] = [rootBus];
    while (queue.length) {
      const at = queue.shift()!;
      const node = busNodes.get(at)!;
      const feeders: Node[] = [];
      for (const e of adjacency.get(at) ?? []) {
        if (usedEdges.has(e)) continue;
        usedEdges.add(e);
        const forward = e.fromBus === at;
        const other = forward ? e.toBus : e.fromBus;
        if (other === at) continue;
        if (placed.has(other)) {
          addNote(other, `also fed from ${at} via ${e.id}`);
          continue;
        }
        const on = markers(e.id);
        const lineEnd = forward ? 'from' : 'to';
        const via: ViaBranch = {
          collection: e.collection,
          index: e.index,
          id: e.id,
          text: e.text,
          lineSide: on.filter((d) => d.end === lineEnd),
          loadSide: on.filter((d) => d.end !== lineEnd),
        };
        feeders.push(busNode(other, via));
        placed.set(other, owner);
        queue.push(other);
      }
      const leaves: Node[] = [];
      for (const e of openTiesAt.get(at) ?? []) {
        const other = e.fromBus === at ? e.toBus : e.fromBus;
        leaves.push({
          row: {
            kind: 'open-tie',
            key: `ties[${e.index}]@${at}`,
            ref: { collection: 'ties', index: e.index },
            id: e.id,
            text: `open tie to ${other}`,
            devices: markers(e.id),
          },
          children: [],
        });
      }
      for (const mi of motorsAt.get(at) ?? []) {
        const m = motors[mi];
        const rating = m.hp !== undefined ? `${num(m.hp)} hp` : m.kva !== undefined ? `${num(m.kva)} kVA` : '—';
        leaves.push({
          row: {
            kind: 'motor',
            key: `motors[${mi}]`,
            ref: { collection: 'motors', index: mi },
            id: m.id,
            text: `${rating} · ${num(m.kv)} kV`,
            devices: markers(m.id),
          },
          children: [],
        });
      }
      node.children.push(...feeders, ...leaves);
    }
    return root;
  };

  const roots: Node[] = [];
  sources.forEach((s, i) => {
    const sourceRow: Node = {
      row: {
        kind: 'source',
        key: `sources[${i}]`,
        ref: { collection: 'sources', index: i },
        id: s.id,
        label: s.kind === 'generator' ? 'GEN' : 'UTIL',
        text: sourceText(s),
        devices: markers(s.id),
      },
      children: [],
    };
    if (!busIndex.has(s.bus)) {
      (sourceRow.row as { note?: string }).note = `unknown bus ${s.bus ? `"${s.bus}"` : '(none)'}`;
    } else if (placed.has(s.bus)) {
      const under = placed.get(s.bus)!;
      addNote(s.bus, `also fed from ${s.id}`);
      sourceRow.children.push({
        row: {
          kind: 'seen-bus',
          key: `seen:${i}:${s.bus}`,
          id: s.bus,
          ref: { collection: 'buses', index: busIndex.get(s.bus)! },
          text: `shown under ${under}`,
        },
        children: [],
      });
    } else {
      sourceRow.children.push(grow(s.bus, s.id));
    }
    roots.push(sourceRow);
  });

  const rows: TreeRow[] = [];
  for (const r of roots) flatten(r, 0, [], true, rows);

  const islandRoots: Node[] = [];
  buses.forEach((b, i) => {
    if (busIndex.get(b.id) !== i || placed.has(b.id)) return;
    islandRoots.push(grow(b.id, `island ${b.id}`));
  });
  if (islandRoots.length) {
    rows.push(
      heading(
        'islands',
        `Not fed from any source (${islandRoots.length === 1 ? '1 island' : `${islandRoots.length} islands`})`,
      ),
    );
    for (const r of islandRoots) flatten(r, 0, [], true, rows);
  }
  if (unconnected.length) {
    rows.push(heading('unconnected', 'Unknown buses'));
    for (const r of unconnected) flatten(r, 0, [], true, rows);
  }
  return rows;
}

function heading(key: string, text: string): TreeRow {
  return { kind: 'heading', key: `heading:${key}`, text, depth: 0, guides: [], last: true, hasChildren: false };
}

function flatten(node: Node, depth: number, guides: boolean[], last: boolean, out: TreeRow[]) {
  out.push({ ...(node.row as TreeRow), depth, guides, last, hasChildren: node.children.length > 0 } as TreeRow);
  node.children.forEach((child, i) => {
    const childLast = i === node.children.length - 1;
    // The child's own elbow sits in column `depth`; columns before it continue where an ancestor has later siblings.
    flatten(child, depth + 1, depth === 0 ? [] : [...guides, !last], childLast, out);
  });
}
