/**
 * Lays out the one-line diagram of a system model (layered, sources at the top, power flowing down) with dagre, and
 * returns the geometry (`geometry.ts`) that every renderer draws.
 *
 * Buses are horizontal bars. A feeder whose far bus feeds nothing further (and has no source) is packed under its bus
 * as a column (devices, branch symbol, the far bus and its motors), so a large radial plant stays a small layered
 * graph for dagre: dagre places the backbone — sources, buses that feed further, the branches between them and ties —
 * and the columns move with their bus. Devices sit on the branch end they belong to, or on their source or motor.
 */
import { Graph, layout as dagreLayout } from '@dagrejs/dagre';
import { BASE_SCENARIO_ID, type Model, type PlacedDevice } from '../schemas/model';
import type { DeviceKind } from '../schemas/device';
import { formatCalPerCm2 } from '../labelDisplay';
import {
  textBox,
  textWidth,
  toggleText,
  type BusHazard,
  type Connection,
  type DrawnElement,
  type ElementKind,
  type Shape,
  type OneLineDrawing,
} from './geometry';

export interface OneLineOptions {
  /** Hazard by bus id (from the study's results). */
  hazards?: ReadonlyMap<string, BusHazard>;
  /** Element ids named in model problems. */
  problems?: ReadonlySet<string>;
  /** Scenario whose out-of-service elements are dashed (default: the model as written). */
  scenarioId?: string;
  /** Buses whose subtree is drawn as one summary box (see `busTree`, `defaultCollapsed`). */
  collapsed?: Iterable<string>;
}

const FONT = 11;
const ID_FONT = 11;
/** x of the symbol axis inside a column. */
const AX = 16;
const LABEL_X = 32;
const BAR_H = 5;
const GAP = 10;
const LINE_H = 14;

type BranchKind = 'transformer' | 'cable' | 'tie';
interface Branch {
  id: string;
  kind: BranchKind;
  from: string;
  to: string;
  open: boolean;
}

/** A piece of a vertical column: a symbol of height h centred on the axis, with its label to the right. */
interface Item {
  id: string;
  kind: ElementKind;
  w: number;
  h: number;
  label: string[];
  dashed?: boolean;
  problem?: boolean;
  busId?: string;
  deviceKind?: DeviceKind;
  draw: (cx: number, top: number, tone: Shape['tone'], dashed: boolean) => Shape[];
}

interface Placed {
  elements: DrawnElement[];
  connections: Connection[];
}

const deviceItem = (d: PlacedDevice, busId: string | undefined, problem: boolean): Item => {
  const kind = d.device.kind;
  const label = [d.id];
  if (kind === 'fuse') {
    return {
      id: d.id,
      kind: 'device',
      deviceKind: kind,
      w: 10,
      h: 22,
      label,
      busId,
      problem,
      draw: (cx, top, tone) => [
        { t: 'rect', x: cx - 5, y: top, w: 10, h: 22, tone, fill: 'surface' },
        { t: 'line', pts: [cx, top, cx, top + 22], tone, width: 1.2 },
      ],
    };
  }
  if (kind === 'relay') {
    // The breaker it trips (square) with the time-overcurrent relay (device function 51) beside it.
    return {
      id: d.id,
      kind: 'device',
      deviceKind: kind,
      w: 16,
      h: 16,
      label,
      busId,
      problem,
      draw: (cx, top, tone) => [
        { t: 'rect', x: cx - 8, y: top, w: 16, h: 16, tone, fill: 'surface' },
        { t: 'line', pts: [cx + 8, top + 8, cx + 14, top + 8], tone, width: 1, dashed: true },
        { t: 'circle', cx: cx + 21, cy: top + 8, r: 7, tone, fill: 'surface' },
        { t: 'text', x: cx + 21, y: top + 11, text: '51', size: 7, anchor: 'middle', tone },
      ],
    };
  }
  return {
    id: d.id,
    kind: 'device',
    deviceKind: kind,
    w: 16,
    h: 16,
    label,
    busId,
    problem,
    draw: (cx, top, tone) => [{ t: 'rect', x: cx - 8, y: top, w: 16, h: 16, tone, fill: 'surface' }],
  };
};

const branchItem = (b: Branch, busId: string | undefined, problem: boolean): Item => {
  if (b.kind === 'transformer') {
    return {
      id: b.id,
      kind: 'transformer',
      w: 22,
      h: 36,
      label: [b.id],
      busId,
      problem,
      draw: (cx, top, tone, dashed) => [
        { t: 'circle', cx, cy: top + 11, r: 11, tone, dashed },
        { t: 'circle', cx, cy: top + 25, r: 11, tone, dashed },
      ],
    };
  }
  if (b.kind === 'cable') {
    return {
      id: b.id,
      kind: 'cable',
      w: 12,
      h: 30,
      label: [b.id],
      busId,
      problem,
      draw: (cx, top, tone, dashed) => [
        { t: 'line', pts: [cx, top, cx, top + 30], tone, width: 1.5, dashed },
        // Terminations at both ends (the cable symbol).
        { t: 'line', pts: [cx - 6, top + 6, cx, top, cx + 6, top + 6], tone, width: 1.2 },
        { t: 'line', pts: [cx - 6, top + 24, cx, top + 30, cx + 6, top + 24], tone, width: 1.2 },
      ],
    };
  }
  return {
    id: b.id,
    kind: 'tie',
    w: 14,
    h: 26,
    label: [b.id, b.open ? 'open' : 'closed'],
    busId,
    problem,
    dashed: b.open,
    draw: (cx, top, tone, dashed) => [
      { t: 'circle', cx, cy: top + 3, r: 2.5, tone, fill: 'surface' },
      { t: 'circle', cx, cy: top + 23, r: 2.5, tone, fill: 'surface' },
      // The switch blade: straight when closed, swung open when open.
      b.open
        ? { t: 'line', pts: [cx, top + 21, cx + 9, top + 6], tone, width: 1.5, dashed }
        : { t: 'line', pts: [cx, top + 21, cx, top + 5], tone, width: 1.5 },
    ],
  };
};

const machineItem = (
  id: string,
  kind: 'utility' | 'generator' | 'motor',
  busId: string | undefined,
  dashed: boolean,
  problem: boolean,
): Item => {
  if (kind === 'utility') {
    return {
      id,
      kind,
      w: 28,
      h: 28,
      label: [id, 'utility'],
      busId,
      dashed,
      problem,
      draw: (cx, top, tone, d) => [
        { t: 'rect', x: cx - 14, y: top, w: 28, h: 28, tone, fill: 'surface', dashed: d },
        { t: 'line', pts: [cx - 14, top + 14, cx, top], tone, width: 1 },
        { t: 'line', pts: [cx - 14, top + 28, cx + 14, top], tone, width: 1 },
        { t: 'line', pts: [cx, top + 28, cx + 14, top + 14], tone, width: 1 },
      ],
    };
  }
  const letter = kind === 'generator' ? 'G' : 'M';
  return {
    id,
    kind,
    w: 26,
    h: 26,
    label: [id],
    busId,
    dashed,
    problem,
    draw: (cx, top, tone, d) => [
      { t: 'circle', cx, cy: top + 13, r: 13, tone, fill: 'surface', dashed: d },
      { t: 'text', x: cx, y: top + 17, text: letter, size: 11, anchor: 'middle', tone, bold: true },
    ],
  };
};

const labelWidth = (lines: string[]) => Math.max(0, ...lines.map((l) => textWidth(l, FONT)));
const itemsWidth = (items: Item[]) =>
  Math.max(AX * 2, ...items.map((i) => LABEL_X + (i.w > 20 ? (i.w - 20) / 2 : 0) + labelWidth(i.label) + 6));
const itemsHeight = (items: Item[]) => items.reduce((s, i) => s + i.h + GAP, 0);

/**
 * Draws a vertical stack of items at (left, top) on the axis left + AX; returns the placed elements, the lines between
 * consecutive items, and the first and last element with their attach points.
 */
function drawStack(
  items: Item[],
  left: number,
  top: number,
  out: Placed,
): { first: { id: string; x: number; y: number }; last: { id: string; x: number; y: number }; bottom: number } {
  const cx = left + AX;
  let y = top;
  let prev: { id: string; y: number; dashed: boolean } | null = null;
  let first: { id: string; x: number; y: number } | null = null;
  for (const it of items) {
    const dashed = !!it.dashed;
    const tone: Shape['tone'] = it.problem ? 'problem' : 'ink';
    const shapes: Shape[] = it.draw(cx, y, tone, dashed);
    const labelX = cx + Math.max(it.w / 2, 8) + 8 + (it.kind === 'device' && shapes.length > 2 ? 22 : 0);
    it.label.forEach((text, i) =>
      shapes.push({
        t: 'text',
        x: labelX,
        y: y + it.h / 2 + 4 + (i - (it.label.length - 1) / 2) * 12,
        text,
        size: i === 0 ? ID_FONT : FONT - 1,
        anchor: 'start',
        tone: i === 0 ? 'ink' : 'muted',
        bold: i === 0 && it.kind !== 'device',
      }),
    );
    if (it.problem) {
      shapes.push({
        t: 'text',
        x: cx - it.w / 2 - 4,
        y: y + it.h / 2 + 4,
        text: '!',
        size: 12,
        anchor: 'end',
        tone: 'problem',
        bold: true,
      });
    }
    out.elements.push({
      id: it.id,
      kind: it.kind,
      box: { x: cx - it.w / 2, y, w: it.w, h: it.h },
      busId: it.busId,
      deviceKind: it.deviceKind,
      dashed: dashed || undefined,
      problem: it.problem || undefined,
      shapes,
    });
    if (prev)
      out.connections.push({
        a: prev.id,
        b: it.id,
        pts: [cx, prev.y, cx, y],
        dashed: prev.dashed || dashed || undefined,
      });
    if (!first) first = { id: it.id, x: cx, y };
    prev = { id: it.id, y: y + it.h, dashed };
    y += it.h + GAP;
  }
  return { first: first!, last: { id: prev!.id, x: cx, y: prev!.y }, bottom: y - GAP };
}

interface BusBlockSpec {
  id: string;
  label: string[];
  labelTones: Shape['tone'][];
  problem: boolean;
  /** Columns hanging under the bar (packed). */
  columns: Column[];
  /** A bus that feeds further: the buses of its subtree and whether it is collapsed (the app's toggle). */
  subtree?: { buses: number; collapsed: boolean };
}

const TOGGLE_FONT = 10;
const TOGGLE_H = 15;
const toggleWidth = (t: { buses: number }) =>
  textWidth(toggleText({ buses: t.buses, collapsed: true }), TOGGLE_FONT) + 12;
/** Width of a bus's label: its lines, and its id (12 px, bold) followed by the toggle where it has one. */
const busLabelWidth = (spec: BusBlockSpec) =>
  Math.max(
    labelWidth(spec.label),
    textWidth(spec.label[0] ?? '', 12) + (spec.subtree ? 8 + toggleWidth(spec.subtree) : 0),
  );

/** A packed column: a stack of items, optionally ending on a leaf bus with its own columns (motors). */
interface Column {
  items: Item[];
  leaf?: BusBlockSpec;
  /** Upper connection dashed (e.g. its branch open). */
  w: number;
  h: number;
}

function busLabel(
  model: Model,
  busId: string,
  opts: OneLineOptions,
  scenarioCount: number,
): { label: string[]; tones: Shape['tone'][] } {
  const bus = model.buses.find((b) => b.id === busId);
  const lines = [busId];
  const tones: Shape['tone'][] = ['ink'];
  if (bus) {
    const name = bus.name ?? '';
    lines.push(`${name.length > 28 ? `${name.slice(0, 27)}…` : name}${name ? ' · ' : ''}${formatKv(bus.nominalKv)}`);
    tones.push('muted');
  }
  const h = opts.hazards?.get(busId);
  if (h) {
    lines.push(`${formatCalPerCm2(h.incidentEnergyCalPerCm2)} cal/cm² · ${h.signalWord ?? 'no signal word'}`);
    tones.push(h.signalWord === 'DANGER' ? 'danger' : 'caution');
    if (scenarioCount > 1 && h.scenario) {
      lines.push(`governed by: ${h.scenario}`);
      tones.push('muted');
    }
  }
  if (opts.problems?.has(busId)) {
    lines.push('! model problem');
    tones.push('problem');
  }
  return { label: lines, tones };
}

const formatKv = (kv: number) => (kv < 1 ? `${Math.round(kv * 1000)} V` : `${Number(kv.toFixed(3))} kV`);

const LEAF_LABEL_X = 26;

function columnSize(c: Column): void {
  const stackW = itemsWidth(c.items);
  const stackH = itemsHeight(c.items);
  if (!c.leaf) {
    c.w = stackW;
    c.h = stackH - GAP;
    return;
  }
  for (const m of c.leaf.columns) columnSize(m);
  const motorsW = c.leaf.columns.reduce((s, m) => s + m.w + 8, 0);
  const labelH = c.leaf.label.length * LINE_H + 4;
  c.w = Math.max(stackW, LEAF_LABEL_X + busLabelWidth(c.leaf) + 8, motorsW);
  const motorsH = Math.max(0, ...c.leaf.columns.map((m) => m.h));
  c.h = stackH + labelH + BAR_H + (motorsH ? GAP + motorsH : 0);
}

function drawBusBar(
  spec: BusBlockSpec,
  x: number,
  y: number,
  w: number,
  labelX: number,
  labelTop: number,
  out: Placed,
): DrawnElement {
  const tone: Shape['tone'] = spec.problem ? 'problem' : 'ink';
  const shapes: Shape[] = [{ t: 'rect', x, y, w, h: BAR_H, tone, fill: tone }];
  spec.label.forEach((text, i) =>
    shapes.push({
      t: 'text',
      x: labelX,
      y: labelTop + 11 + i * LINE_H,
      text,
      size: i === 0 ? 12 : FONT,
      anchor: 'start',
      tone: spec.labelTones[i] ?? 'ink',
      bold: i === 0 || spec.labelTones[i] === 'danger' || spec.labelTones[i] === 'caution',
    }),
  );
  const el: DrawnElement = {
    id: spec.id,
    kind: 'bus',
    box: { x, y, w, h: BAR_H },
    busId: spec.id,
    problem: spec.problem || undefined,
    shapes,
  };
  if (spec.subtree) {
    el.subtree = {
      ...spec.subtree,
      toggle: {
        x: labelX + textWidth(spec.label[0] ?? '', 12) + 8,
        y: labelTop,
        w: toggleWidth(spec.subtree),
        h: TOGGLE_H,
      },
    };
  }
  out.elements.push(el);
  return el;
}

/** Draws packed columns hanging from a bar at barY, starting at x; returns nothing (adds to out). */
function drawColumns(cols: Column[], busId: string, x0: number, barY: number, out: Placed): void {
  let x = x0;
  for (const c of cols) {
    const top = barY + BAR_H + GAP;
    const s = drawStack(c.items, x, top, out);
    out.connections.push({ a: busId, b: s.first.id, pts: [s.first.x, barY + BAR_H, s.first.x, s.first.y] });
    if (c.leaf) {
      const labelTop = s.bottom + 4;
      const leafBarY = labelTop + c.leaf.label.length * LINE_H + 4;
      drawBusBar(c.leaf, x, leafBarY, c.w, x + LEAF_LABEL_X, labelTop, out);
      out.connections.push({ a: s.last.id, b: c.leaf.id, pts: [s.last.x, s.last.y, s.last.x, leafBarY] });
      drawColumns(c.leaf.columns, c.leaf.id, x, leafBarY, out);
    }
    x += c.w + 8;
  }
}

/**
 * The buses as a tree: each bus's level (breadth-first from the buses with sources, then from any bus not reached,
 * over every branch whatever its state) and the bus it was reached from. A bus's subtree is what it was the first to
 * reach; collapsing a bus hides its subtree.
 */
export function busTree(model: Model): { level: Map<string, number>; parent: Map<string, string> } {
  const busIds = new Set(model.buses.map((b) => b.id));
  const adj = new Map<string, string[]>();
  for (const b of [...model.transformers, ...model.cables, ...model.ties]) {
    if (b.fromBus === b.toBus || !busIds.has(b.fromBus) || !busIds.has(b.toBus)) continue;
    for (const [a, z] of [
      [b.fromBus, b.toBus],
      [b.toBus, b.fromBus],
    ]) {
      const list = adj.get(a);
      if (list) list.push(z);
      else adj.set(a, [z]);
    }
  }
  const level = new Map<string, number>();
  const parent = new Map<string, string>();
  const queue: string[] = [];
  const spread = () => {
    for (let head = 0; head < queue.length; head++) {
      const bus = queue[head];
      for (const other of adj.get(bus) ?? []) {
        if (level.has(other)) continue;
        level.set(other, level.get(bus)! + 1);
        parent.set(other, bus);
        queue.push(other);
      }
    }
    queue.length = 0;
  };
  // Every source's bus at level 0 together, then each part no source reaches from its first bus.
  for (const s of model.sources) {
    if (busIds.has(s.bus) && !level.has(s.bus)) {
      level.set(s.bus, 0);
      queue.push(s.bus);
    }
  }
  spread();
  for (const b of model.buses) {
    if (level.has(b.id)) continue;
    level.set(b.id, 0);
    queue.push(b.id);
    spread();
  }
  return { level, parent };
}

/** Above this many buses a diagram opens with the subtrees below the second level collapsed. */
export const LARGE_MODEL_BUSES = 150;

/**
 * The buses collapsed when a diagram opens: none for a model of up to LARGE_MODEL_BUSES buses; above, every bus of
 * the second level (one branch from a source's bus) that feeds further, so the first view shows two levels of buses
 * and one summary per subtree.
 */
export function defaultCollapsed(model: Model): string[] {
  if (model.buses.length <= LARGE_MODEL_BUSES) return [];
  const { level, parent } = busTree(model);
  const feeds = new Set(parent.values());
  return model.buses.filter((b) => level.get(b.id) === 1 && feeds.has(b.id)).map((b) => b.id);
}

export function layoutOneLine(model: Model, opts: OneLineOptions = {}): OneLineDrawing {
  const problems = opts.problems ?? new Set<string>();
  const scenario =
    opts.scenarioId && opts.scenarioId !== BASE_SCENARIO_ID
      ? model.scenarios?.find((s) => s.id === opts.scenarioId)
      : undefined;
  const scenarioCount = 1 + (model.scenarios?.length ?? 0);
  const busIds = new Set(model.buses.map((b) => b.id));
  const { level, parent } = busTree(model);

  // Subtrees: each bus's descendants; a collapsed bus (not itself inside a collapsed subtree) hides its own.
  const children = new Map<string, string[]>();
  for (const [c, p] of parent) {
    const list = children.get(p);
    if (list) list.push(c);
    else children.set(p, [c]);
  }
  const descendants = (bus: string): string[] => {
    const out: string[] = [];
    const stack = [...(children.get(bus) ?? [])];
    while (stack.length) {
      const b = stack.pop()!;
      out.push(b);
      stack.push(...(children.get(b) ?? []));
    }
    return out;
  };
  const subtreeSize = new Map<string, number>();
  for (const b of [...model.buses].sort((x, y) => level.get(y.id)! - level.get(x.id)!)) {
    const n = (children.get(b.id) ?? []).reduce((s, c) => s + 1 + (subtreeSize.get(c) ?? 0), 0);
    if (n) subtreeSize.set(b.id, n);
  }
  const hiddenBy = new Map<string, string>();
  const collapsedOrder = [...new Set(opts.collapsed ?? [])]
    .filter((id) => busIds.has(id) && subtreeSize.has(id))
    .sort((a, b) => level.get(a)! - level.get(b)!);
  const collapsed: string[] = [];
  for (const bus of collapsedOrder) {
    if (hiddenBy.has(bus)) continue;
    collapsed.push(bus);
    for (const d of descendants(bus)) hiddenBy.set(d, bus);
  }
  /** What each collapsed bus's summary stands for: the hidden buses, then every other hidden element. */
  const hiddenIn = new Map<string, { buses: string[]; others: string[] }>(
    collapsed.map((b) => [b, { buses: [], others: [] }]),
  );
  for (const b of model.buses) {
    const owner = hiddenBy.get(b.id);
    if (owner) hiddenIn.get(owner)!.buses.push(b.id);
  }
  const hide = (id: string, owner: string | undefined): boolean => {
    if (!owner) return false;
    hiddenIn.get(owner)!.others.push(id);
    return true;
  };
  const ownerOf = (...buses: string[]) => buses.map((b) => hiddenBy.get(b)).find((o) => o !== undefined);

  const allBranches: Branch[] = [
    ...model.transformers.map((t) => ({
      id: t.id,
      kind: 'transformer' as const,
      from: t.fromBus,
      to: t.toBus,
      open: false,
    })),
    ...model.cables.map((c) => ({ id: c.id, kind: 'cable' as const, from: c.fromBus, to: c.toBus, open: false })),
    ...model.ties.map((t) => ({
      id: t.id,
      kind: 'tie' as const,
      from: t.fromBus,
      to: t.toBus,
      open: !(scenario?.ties?.[t.id]?.closed ?? t.closed),
    })),
  ];
  const hiddenHolders = new Map<string, string>();
  const branches = allBranches.filter((b) => {
    const owner = ownerOf(b.from, b.to);
    if (owner) hiddenHolders.set(b.id, owner);
    return !hide(b.id, owner);
  });
  const sources = model.sources.filter((s) => {
    const owner = ownerOf(s.bus);
    if (owner) hiddenHolders.set(s.id, owner);
    return !hide(s.id, owner);
  });
  const motors = model.motors.filter((m) => {
    const owner = ownerOf(m.bus);
    if (owner) hiddenHolders.set(m.id, owner);
    return !hide(m.id, owner);
  });
  const sourceOut = (id: string) => scenario?.sources?.[id]?.inService === false;
  const motorOut = (id: string) => !!scenario?.allMotorsOff || scenario?.motors?.[id]?.inService === false;

  // Devices by what they sit on (those on a hidden branch, source or motor are hidden with it).
  const devicesAt = new Map<string, PlacedDevice[]>();
  const orphanDevices: PlacedDevice[] = [];
  const branchIds = new Set(branches.map((b) => b.id));
  const holderIds = new Set([...sources.map((s) => s.id), ...motors.map((m) => m.id)]);
  for (const d of model.devices) {
    if (hide(d.id, hiddenHolders.get(d.branch ?? d.source ?? ''))) continue;
    const key = d.branch ? `${d.branch}:${d.end ?? 'from'}` : (d.source ?? '');
    const known = d.branch ? branchIds.has(d.branch) : holderIds.has(d.source ?? '');
    if (!known) {
      orphanDevices.push(d);
      continue;
    }
    devicesAt.set(key, [...(devicesAt.get(key) ?? []), d]);
  }
  const devItems = (key: string, busId: string | undefined) =>
    (devicesAt.get(key) ?? []).map((d) => deviceItem(d, busId, problems.has(d.id)));

  // Every branch between known buses, hidden or not (whether a bus has only one).
  const adj = new Map<string, Branch[]>();
  for (const b of allBranches) {
    if (b.from === b.to) continue;
    for (const end of [b.from, b.to]) if (busIds.has(end)) adj.set(end, [...(adj.get(end) ?? []), b]);
  }

  // Each branch: down (upper → lower) or lateral (same level); unknown ends dropped.
  const upper = (b: Branch) => (level.get(b.to)! < level.get(b.from)! ? b.to : b.from);
  const lower = (b: Branch) => (upper(b) === b.from ? b.to : b.from);
  const endOf = (b: Branch, bus: string): 'from' | 'to' => (bus === b.from ? 'from' : 'to');
  const sourcesAt = new Set(sources.filter((s) => busIds.has(s.bus)).map((s) => s.bus));
  const motorsAt = new Map<string, Model['motors']>();
  for (const m of motors) if (busIds.has(m.bus)) motorsAt.set(m.bus, [...(motorsAt.get(m.bus) ?? []), m]);

  const motorColumn = (m: Model['motors'][number]): Column => ({
    items: [...devItems(m.id, m.bus), machineItem(m.id, 'motor', m.bus, motorOut(m.id), problems.has(m.id))],
    w: 0,
    h: 0,
  });
  const busSpec = (busId: string, columns: Column[]): BusBlockSpec => {
    const { label, tones } = busLabel(model, busId, opts, scenarioCount);
    const n = subtreeSize.get(busId);
    return {
      id: busId,
      label,
      labelTones: tones,
      problem: problems.has(busId),
      columns,
      subtree: n ? { buses: n, collapsed: hiddenIn.has(busId) } : undefined,
    };
  };
  const branchItems = (b: Branch): Item[] => {
    const up = upper(b);
    const down = lower(b);
    return [
      ...devItems(`${b.id}:${endOf(b, up)}`, down),
      branchItem(b, down, problems.has(b.id)),
      ...devItems(`${b.id}:${endOf(b, down)}`, down),
    ];
  };

  // Packed: a down branch whose lower bus has only that branch and no source.
  const packed = new Set<string>();
  const packedUnder = new Map<string, Branch[]>();
  for (const b of branches) {
    if (!busIds.has(b.from) || !busIds.has(b.to) || b.from === b.to) continue;
    const down = lower(b);
    if (level.get(down) === level.get(upper(b))) continue;
    if ((adj.get(down)?.length ?? 0) !== 1 || sourcesAt.has(down)) continue;
    packed.add(b.id);
    packedUnder.set(upper(b), [...(packedUnder.get(upper(b)) ?? []), b]);
  }
  const packedBuses = new Set([...packed].map((id) => lower(branches.find((b) => b.id === id)!)));

  // dagre: the backbone.
  const g = new Graph();
  g.setGraph({ rankdir: 'TB', nodesep: 28, ranksep: 36, marginx: 16, marginy: 16, ranker: 'longest-path' });
  g.setDefaultEdgeLabel(() => ({}));
  interface NodeData {
    width: number;
    height: number;
    x?: number;
    y?: number;
    draw: (left: number, top: number, out: Placed) => void;
    /** Where a line from above ends / a line down starts, once drawn. */
    topPort?: (x: number) => { id: string; x: number; y: number };
    bottomPort?: (x: number) => { id: string; x: number; y: number };
  }
  const nodes = new Map<string, NodeData>();
  const lateral = new Map<string, LateralNode>();
  const edges: { v: string; w: string; dashed?: boolean; side?: 'left' | 'right' }[] = [];

  // Bus blocks.
  const incoming = new Map<string, number>();
  const outgoing = new Map<string, number>();
  for (const b of branches) {
    if (packed.has(b.id) || !busIds.has(b.from) || !busIds.has(b.to) || b.from === b.to) continue;
    const lat = level.get(b.from) === level.get(b.to);
    if (lat) {
      for (const e of [b.from, b.to]) outgoing.set(e, (outgoing.get(e) ?? 0) + 1);
    } else {
      outgoing.set(upper(b), (outgoing.get(upper(b)) ?? 0) + 1);
      incoming.set(lower(b), (incoming.get(lower(b)) ?? 0) + 1);
    }
  }
  for (const s of sources) if (busIds.has(s.bus)) incoming.set(s.bus, (incoming.get(s.bus) ?? 0) + 1);
  for (const bus of collapsed) outgoing.set(bus, (outgoing.get(bus) ?? 0) + 1);

  for (const bus of model.buses) {
    if (packedBuses.has(bus.id) || hiddenBy.has(bus.id)) continue;
    const columns: Column[] = [
      ...(motorsAt.get(bus.id) ?? []).map(motorColumn),
      ...(packedUnder.get(bus.id) ?? []).map((b) => {
        const leafId = lower(b);
        return {
          items: branchItems(b),
          leaf: busSpec(leafId, (motorsAt.get(leafId) ?? []).map(motorColumn)),
          w: 0,
          h: 0,
        } as Column;
      }),
    ];
    for (const c of columns) columnSize(c);
    const spec = busSpec(bus.id, columns);
    const labelW = busLabelWidth(spec) + 12;
    const labelH = spec.label.length * LINE_H + 6;
    const packedW = columns.reduce((s, c) => s + c.w + 8, 0);
    const ports = (incoming.get(bus.id) ?? 0) + (outgoing.get(bus.id) ?? 0);
    const corridorW = Math.max(48, ports * 18);
    const corridorStart = Math.max(labelW, packedW) + 8;
    const width = corridorStart + corridorW;
    const packedH = Math.max(0, ...columns.map((c) => c.h));
    const height = labelH + BAR_H + (packedH ? GAP + packedH : 0) + 6;
    let barY = 0;
    let left = 0;
    const data: NodeData = {
      width,
      height,
      draw: (l, t, out) => {
        left = l;
        barY = t + labelH;
        drawBusBar(spec, l, barY, width, l + 4, t, out);
        drawColumns(columns, bus.id, l + 4, barY, out);
      },
      topPort: (x) => ({ id: bus.id, x: clamp(x, left + corridorStart + 6, left + width - 6), y: barY }),
      bottomPort: (x) => ({ id: bus.id, x: clamp(x, left + corridorStart + 6, left + width - 6), y: barY + BAR_H }),
    };
    nodes.set(`bus:${bus.id}`, data);
  }

  // A collapsed subtree: one summary box under its bus.
  for (const bus of collapsed) {
    const summary = summaryBox(bus, hiddenIn.get(bus)!, opts.hazards, problems);
    let left = 0;
    let top = 0;
    nodes.set(`sum:${bus}`, {
      width: summary.w,
      height: summary.h,
      draw: (l, t, out) => {
        left = l;
        top = t;
        out.elements.push(summary.draw(l, t));
      },
      topPort: (x) => ({ id: summary.id, x: clamp(x, left + 8, left + summary.w - 8), y: top }),
    });
    edges.push({ v: `bus:${bus}`, w: `sum:${bus}` });
  }

  const stackNode = (items: Item[]): NodeData => {
    const w = itemsWidth(items) + 4;
    const h = itemsHeight(items) - GAP;
    let drawn: ReturnType<typeof drawStack> | null = null;
    return {
      width: w,
      height: h,
      draw: (l, t, out) => {
        drawn = drawStack(items, l, t, out);
      },
      topPort: () => drawn!.first,
      bottomPort: () => drawn!.last,
    };
  };

  for (const s of sources) {
    const onBus = busIds.has(s.bus);
    const items = [
      machineItem(s.id, s.kind, onBus ? s.bus : undefined, sourceOut(s.id), problems.has(s.id)),
      ...devItems(s.id, onBus ? s.bus : undefined),
    ];
    nodes.set(`src:${s.id}`, stackNode(items));
    if (onBus) edges.push({ v: `src:${s.id}`, w: `bus:${s.bus}`, dashed: sourceOut(s.id) });
  }
  for (const m of motors) {
    if (busIds.has(m.bus)) continue; // drawn under its bus
    nodes.set(`mot:${m.id}`, stackNode(motorColumn(m).items));
  }
  for (const d of orphanDevices) nodes.set(`dev:${d.id}`, stackNode([deviceItem(d, undefined, true)]));

  for (const b of branches) {
    if (packed.has(b.id)) continue;
    const fromOk = busIds.has(b.from);
    const toOk = busIds.has(b.to);
    if (!fromOk || !toOk || b.from === b.to) {
      const items = [
        ...devItems(`${b.id}:from`, undefined),
        branchItem(b, undefined, true),
        ...devItems(`${b.id}:to`, undefined),
      ];
      nodes.set(`br:${b.id}`, stackNode(items));
      if (fromOk) edges.push({ v: `bus:${b.from}`, w: `br:${b.id}` });
      else if (toOk) edges.push({ v: `bus:${b.to}`, w: `br:${b.id}` });
      continue;
    }
    if (level.get(b.from) === level.get(b.to)) {
      const node = lateralNode(b, devItems, problems.has(b.id));
      lateral.set(`lat:${b.id}`, node);
      nodes.set(`lat:${b.id}`, node);
      edges.push({ v: `bus:${b.from}`, w: `lat:${b.id}`, dashed: b.open, side: 'left' });
      edges.push({ v: `bus:${b.to}`, w: `lat:${b.id}`, dashed: b.open, side: 'right' });
      continue;
    }
    nodes.set(`br:${b.id}`, stackNode(branchItems(b)));
    edges.push({ v: `bus:${upper(b)}`, w: `br:${b.id}`, dashed: b.open });
    edges.push({ v: `br:${b.id}`, w: `bus:${lower(b)}`, dashed: b.open });
  }

  for (const [id, n] of nodes) g.setNode(id, { width: n.width, height: n.height });
  for (const e of edges) g.setEdge(e.v, e.w);
  // Layers by longest path (network simplex costs seconds on a 2 000-bus mesh). Order within each layer: depth-first from the sources, in model order (a tree then has no crossings, and dagre's
  // crossing reduction, whose cost grows fast with the number of nodes, is not needed).
  dagreLayout(g, { customOrder: depthFirstOrder });

  const out: Placed = { elements: [], connections: [] };
  let width = 0;
  let height = 0;
  for (const [id, n] of nodes) {
    const p = g.node(id) as { x: number; y: number };
    n.x = p.x;
    n.y = p.y;
    n.draw(p.x - n.width / 2, p.y - n.height / 2, out);
    width = Math.max(width, p.x + n.width / 2 + 16);
    height = Math.max(height, p.y + n.height / 2 + 16);
  }
  // The layers as dagre placed them (the nodes of a layer share their centre's y): each layer's top and bottom, so a
  // line's horizontal run lies in the free band above its lower node's layer and never crosses a node's labels.
  const layers = new Map<number, { top: number; bottom: number }>();
  for (const n of nodes.values()) {
    const key = Math.round(n.y!);
    const l = layers.get(key);
    const top = n.y! - n.height / 2;
    const bottom = n.y! + n.height / 2;
    if (l) {
      l.top = Math.min(l.top, top);
      l.bottom = Math.max(l.bottom, bottom);
    } else layers.set(key, { top, bottom });
  }
  const layerYs = [...layers.keys()].sort((a, b) => a - b);
  const bandAbove = (n: NodeData): number | undefined => {
    const k = layerYs.indexOf(Math.round(n.y!));
    if (k <= 0) return undefined;
    const above = layers.get(layerYs[k - 1])!;
    const here = layers.get(layerYs[k])!;
    return above.bottom < here.top ? (above.bottom + here.top) / 2 : undefined;
  };
  const inLayer = (y: number) =>
    layerYs.some((k) => {
      const l = layers.get(k)!;
      return y >= l.top && y <= l.bottom;
    });
  /**
   * Down from (x1, y1) to (x2, y2) through the places dagre kept for the line (its dummy nodes): across only in the
   * free bands between layers, down through a layer only at its own place there, so it passes no node's labels.
   */
  const routeVia = (e: { v: string; w: string }, x1: number, y1: number, x2: number, y2: number, lastY: number) => {
    const via = ((g.edge(e.v, e.w) as { points?: { x: number; y: number }[] } | undefined)?.points ?? []).slice(1, -1);
    const pts = [x1, y1];
    let x = x1;
    const usable = via.filter((p) => p.y > y1 && p.y < lastY);
    usable.forEach((p, i) => {
      if (inLayer(p.y)) return;
      const next = usable.slice(i + 1).find((q) => inLayer(q.y));
      const tx = next ? next.x : x2;
      if (Math.abs(tx - x) < 0.5) return;
      pts.push(x, p.y, tx, p.y);
      x = tx;
    });
    if (Math.abs(x - x2) >= 0.5) pts.push(x, lastY, x2, lastY);
    pts.push(x2, y2);
    return pts;
  };
  for (const e of edges) {
    const up = nodes.get(e.v)!;
    const down = nodes.get(e.w)!;
    const downTop = down.y! - down.height / 2;
    const upBottom = up.y! + up.height / 2;
    const band = bandAbove(down);
    const midY = band !== undefined && band > upBottom ? band : (upBottom + downTop) / 2;
    if (e.side) {
      // A lateral branch: each bus drops to its side of the branch's row.
      const port = lateral.get(e.w)!.port(e.side, up.x!);
      if (!port.around) {
        const from = up.bottomPort!(port.x);
        out.connections.push({
          a: from.id,
          b: port.id,
          pts: routeVia(e, from.x, from.y, port.x, port.y, midY),
          dashed: e.dashed,
        });
      } else {
        const from = up.bottomPort!(port.around.rx);
        const { rx, by } = port.around;
        const pts = [...routeVia(e, from.x, from.y, rx, midY - 6, midY - 6), rx, by, port.x, by, port.x, port.y];
        out.connections.push({ a: from.id, b: port.id, pts, dashed: e.dashed });
      }
      continue;
    }
    const to = down.topPort!(up.x!);
    const from = up.bottomPort!(to.x);
    const end = down.topPort!(from.x);
    out.connections.push({
      a: from.id,
      b: end.id,
      pts: routeVia(e, from.x, from.y, end.x, end.y, midY),
      dashed: e.dashed,
    });
  }
  const notes: string[] = [];
  if (collapsed.length) {
    const n = collapsed.reduce((sum, b) => sum + hiddenIn.get(b)!.buses.length, 0);
    notes.push(
      `Collapsed: ${collapsed.length} subtree${collapsed.length === 1 ? '' : 's'} (${n} buses) drawn as one box each, naming the highest incident energy inside.`,
    );
  }
  if (scenario) notes.push(`Dashed: out of service or open in scenario "${scenario.name ?? scenario.id}".`);
  else notes.push('Dashed: open ties and elements out of service.');
  // Every label on a halo in the background colour, so a line passing behind it never runs through its letters.
  for (const e of out.elements) e.shapes = e.shapes.flatMap((sh) => (sh.t === 'text' ? [haloOf(sh), sh] : [sh]));
  return {
    width: Math.ceil(width),
    height: Math.ceil(height),
    elements: out.elements,
    connections: out.connections,
    collapsed,
    notes,
  };
}

/**
 * The box that stands for a collapsed subtree: how many buses (and other elements) it holds, the highest incident
 * energy among its buses with its signal word and bus (a DANGER elsewhere inside is named too: a collapsed subtree
 * never hides a hazard), and any model problem inside.
 */
function summaryBox(
  bus: string,
  hidden: { buses: string[]; others: string[] },
  hazards: ReadonlyMap<string, BusHazard> | undefined,
  problems: ReadonlySet<string>,
): { id: string; w: number; h: number; draw: (l: number, t: number) => DrawnElement } {
  const nb = hidden.buses.length;
  const no = hidden.others.length;
  const lines: { text: string; tone: Shape['tone']; bold?: boolean }[] = [
    { text: `${nb} bus${nb === 1 ? '' : 'es'} collapsed under ${bus}`, tone: 'ink', bold: true },
  ];
  if (no) lines.push({ text: `and ${no} other element${no === 1 ? '' : 's'}`, tone: 'muted' });
  let worst: { busId: string; h: BusHazard } | undefined;
  const danger: string[] = [];
  for (const id of hidden.buses) {
    const h = hazards?.get(id);
    if (!h) continue;
    if (h.signalWord === 'DANGER') danger.push(id);
    if (
      !worst ||
      h.incidentEnergyCalPerCm2 > worst.h.incidentEnergyCalPerCm2 ||
      (h.incidentEnergyCalPerCm2 === worst.h.incidentEnergyCalPerCm2 &&
        h.signalWord === 'DANGER' &&
        worst.h.signalWord !== 'DANGER')
    )
      worst = { busId: id, h };
  }
  if (worst) {
    lines.push({
      text: `Highest: ${formatCalPerCm2(worst.h.incidentEnergyCalPerCm2)} cal/cm² · ${worst.h.signalWord ?? 'no signal word'} at ${worst.busId}`,
      tone: worst.h.signalWord === 'DANGER' ? 'danger' : 'caution',
      bold: true,
    });
    const otherDanger = danger.filter((id) => id !== worst!.busId);
    if (worst.h.signalWord !== 'DANGER' && otherDanger.length) {
      lines.push({
        text: `DANGER at ${otherDanger[0]}${otherDanger.length > 1 ? ` and ${otherDanger.length - 1} more` : ''}`,
        tone: 'danger',
        bold: true,
      });
    }
    const without = nb - hidden.buses.filter((id) => hazards?.has(id)).length;
    if (without) lines.push({ text: `${without} without a result`, tone: 'muted' });
  } else {
    lines.push({ text: 'No results for these buses', tone: 'muted' });
  }
  const inside = [...hidden.buses, ...hidden.others].filter((id) => problems.has(id));
  if (inside.length) {
    lines.push({
      text: `! model problem at ${inside[0]}${inside.length > 1 ? ` and ${inside.length - 1} more` : ''}`,
      tone: 'problem',
      bold: true,
    });
  }
  const w = Math.max(...lines.map((l) => textWidth(l.text, FONT))) + 20;
  const h = lines.length * LINE_H + 12;
  const id = `summary:${bus}`;
  return {
    id,
    w,
    h,
    draw: (l, t) => ({
      id,
      kind: 'summary',
      box: { x: l, y: t, w, h },
      busId: bus,
      problem: inside.length ? true : undefined,
      summary: {
        of: bus,
        buses: nb,
        hidden: [...hidden.buses, ...hidden.others],
        worst: worst
          ? {
              busId: worst.busId,
              incidentEnergyCalPerCm2: worst.h.incidentEnergyCalPerCm2,
              signalWord: worst.h.signalWord,
            }
          : undefined,
      },
      shapes: [
        { t: 'rect', x: l, y: t, w, h, tone: inside.length ? 'problem' : 'accent', fill: 'surface' },
        ...lines.map((line, i): Shape => ({
          t: 'text',
          x: l + 10,
          y: t + 6 + 11 + i * LINE_H,
          text: line.text,
          size: FONT,
          anchor: 'start',
          tone: line.tone,
          bold: line.bold,
        })),
      ],
    }),
  };
}

/** The background under a text: its box, filled with the surface colour (drawn just before the text). */
function haloOf(t: Extract<Shape, { t: 'text' }>): Shape {
  const b = textBox(t);
  return { t: 'rect', x: b.x, y: b.y, w: b.w, h: b.h, tone: 'surface', fill: 'surface', halo: true };
}

/** dagre `customOrder`: each layer ordered by a depth-first visit from the graph's sources (dummies included). */
function depthFirstOrder(gg: Graph): void {
  const visit = new Map<string, number>();
  let k = 0;
  const stack: string[] = [...gg.sources()].reverse();
  while (stack.length) {
    const v = stack.pop()!;
    if (visit.has(v)) continue;
    visit.set(v, k++);
    const next = gg.successors(v) ?? [];
    for (let i = next.length - 1; i >= 0; i--) if (!visit.has(next[i])) stack.push(next[i]);
  }
  for (const v of gg.nodes()) if (!visit.has(v)) visit.set(v, k++);
  const byRank = new Map<number, string[]>();
  for (const v of gg.nodes()) {
    const r = (gg.node(v) as { rank: number }).rank;
    const list = byRank.get(r);
    if (list) list.push(v);
    else byRank.set(r, [v]);
  }
  for (const list of byRank.values()) {
    list.sort((a, b) => visit.get(a)! - visit.get(b)!);
    list.forEach((v, i) => {
      (gg.node(v) as { order: number }).order = i;
    });
  }
}

const clamp = (x: number, lo: number, hi: number) => Math.min(Math.max(x, lo), Math.max(lo, hi));

interface LateralNode {
  width: number;
  height: number;
  x?: number;
  y?: number;
  draw: (l: number, t: number, out: Placed) => void;
  /** The from bus joins at the top; the to bus by a line round the column's side (toward it) into the bottom. */
  port: (
    side: 'left' | 'right',
    towardX: number,
  ) => { id: string; x: number; y: number; around?: { rx: number; by: number } };
}

/** A branch between buses of the same level (a tie, or a feeder closing a loop): its devices and symbol in a column. */
function lateralNode(
  b: Branch,
  devItems: (key: string, busId: string | undefined) => Item[],
  problem: boolean,
): LateralNode {
  const items = [...devItems(`${b.id}:from`, b.from), branchItem(b, b.from, problem), ...devItems(`${b.id}:to`, b.to)];
  const w = itemsWidth(items) + 4;
  const h = itemsHeight(items) - GAP + 16;
  let drawn: ReturnType<typeof drawStack> | null = null;
  let left = 0;
  let top = 0;
  return {
    width: w,
    height: h,
    draw: (l, t, out) => {
      left = l;
      top = t;
      drawn = drawStack(items, l, t, out);
    },
    port: (side, towardX) => {
      if (side === 'left') return drawn!.first;
      const rx = towardX > left + w / 2 ? left + w - 2 : left + 2;
      return { ...drawn!.last, around: { rx, by: top + h - 4 } };
    },
  };
}
