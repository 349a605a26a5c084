/**
 * Three-phase bolted short-circuit study (docs/ARCHITECTURE.md, Data path of a study run, step 4).
 *
 * Method (superposition with the equivalent voltage source at the fault, IEEE 141 / IEEE 551 practice):
 * - per-unit network (network.ts), bus admittance matrix Ybus, factored once (sparse LDLᵀ, sparse.ts);
 * - all-bus summary: the diagonal of Zbus = Ybus⁻¹ from the factor (Takahashi), I_f = V_prefault / Z_kk,
 *   X/R at the fault = Im(Z_kk) / Re(Z_kk) (X/R of the complex Thevenin impedance);
 * - one fault in detail (`faultAt`): the Zbus column k by one solve; the voltage change at every node
 *   ΔV_i = −Z_ik · I_f; branch currents I = y·(ΔV_from/t − ΔV_to), source and motor currents −ΔV·y.
 * Pre-fault load current is neglected (no-load pre-fault state at the pre-fault voltage, 1.0 pu unless set).
 */
import type { EngineWarning } from '../errors';
import { EngineError } from '../errors';
import { validateModel, type Model, type ModelIssue } from '../../../shared/schemas/model';
import { Complex, cAbs } from './complex';
import { buildAdmittanceMatrix, buildNetwork, type BranchKind, type InjectionKind, type Network } from './network';
import { factorComplexSymmetric, type LdltFactor } from './sparse';

export interface Phasor {
  re: number;
  im: number;
}

/** Bolted three-phase fault at one bus: the all-bus summary row (API `POST /api/calc/short-circuit`). */
export interface BusShortCircuit {
  id: string;
  nominalKv: number;
  /** Symmetrical rms bolted three-phase fault current, kA. */
  boltedFaultKa: number;
  /** X/R ratio of the Thevenin impedance at the fault. */
  xr: number;
}

export interface ShortCircuitResult {
  /** Pre-fault voltage, per unit of nominal. */
  prefaultPu: number;
  buses: BusShortCircuit[];
  warnings: EngineWarning[];
}

/** Direction of fault current in a branch: from its fromBus toward its toBus, the reverse, or none. */
export type FlowDirection = 'from-to' | 'to-from' | 'none';

/** Fault current through one branch (transformer, cable or tie) for one fault. */
export interface BranchFaultCurrent {
  id: string;
  kind: BranchKind;
  fromBus: string;
  toBus: string;
  /** Current magnitude at the from end, amperes at the from bus's nominal voltage. */
  fromCurrentA: number;
  /** Current magnitude at the to end, amperes at the to bus's nominal voltage (differs from fromCurrentA across a transformer). */
  toCurrentA: number;
  /** Phasor at the from end, amperes, positive from → to, angle relative to the pre-fault voltage. */
  fromPhasorA: Phasor;
  /** Phasor at the to end, amperes, positive from → to. */
  toPhasorA: Phasor;
  /** Which way the fault current flows (its in-phase component with the fault current). */
  direction: FlowDirection;
  /** The bus the current flows toward (downstream, nearer the fault); null when no current flows. */
  towardBus: string | null;
}

/** Fault current delivered by one source or motor for one fault. */
export interface InjectionFaultCurrent {
  id: string;
  kind: InjectionKind;
  bus: string;
  /** Magnitude, amperes at the bus's nominal voltage. */
  currentA: number;
  /** Phasor delivered into the bus, amperes. */
  phasorA: Phasor;
}

/** One bolted three-phase fault in detail: the current every branch, source and motor carries. */
export interface BusFault extends BusShortCircuit {
  prefaultPu: number;
  /** Fault current, amperes (= boltedFaultKa × 1000). */
  faultCurrentA: number;
  faultPhasorA: Phasor;
  branches: BranchFaultCurrent[];
  injections: InjectionFaultCurrent[];
}

export interface FaultOptions {
  /** Report only these branches (transformer, cable or tie ids). */
  branchIds?: readonly string[];
  /** Report only these sources and motors. */
  injectionIds?: readonly string[];
}

export interface ShortCircuitSolver {
  /** All-bus summary (cheap: one factorization and the Zbus diagonal). */
  readonly result: ShortCircuitResult;
  readonly busIds: readonly string[];
  /**
   * Branch, source and motor currents for a bolted fault at `busId` (one solve). By default every branch
   * (transformers, cables, then ties) and every source and motor is reported; pass `branchIds` /
   * `injectionIds` to report only those (e.g. the ones carrying protective devices) on large models.
   */
  faultAt(busId: string, options?: FaultOptions): BusFault;
  /**
   * The same fault, reporting only the elements that can carry its current: the branches, ties, sources and motors
   * of the parts of the network between the fault and the sources (the 2-edge-connected components on the path to
   * the reference in the bridge tree). Every other element carries no current (each of its branches joins two
   * nodes at one voltage). The voltages are solved only at the nodes needed (their elimination-tree paths), so the
   * work is proportional to what the fault touches, not to the model. Values equal `faultAt`'s (same operations).
   */
  faultPath(busId: string): BusFault;
  /** Work counters (tests): nodes solved and elements visited by `faultPath` since the solver was made. */
  readonly work: { faults: number; nodeVisits: number; elementVisits: number };
}

/** Relative threshold under which a branch current counts as zero (direction 'none'). */
const NEGLIGIBLE_SHARE = 1e-9;

/** A model that fails `validateModel`: an EngineError ('invalid-input', field = first issue's path) with every issue. */
export class InvalidModelError extends EngineError {
  readonly issues: ModelIssue[];

  constructor(issues: ModelIssue[]) {
    const first = issues[0];
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
    super('invalid-input', 'invalid-model', `${first.path}: ${first.message}${more}`, first.path);
    this.name = 'InvalidModelError';
    this.issues = issues;
  }
}

/** Models parsed from a text `parseModel` accepted as it stands (see `markCheckedModel`). */
const checkedModels = new WeakSet<Model>();

/**
 * Marks a model parsed from a JSON text that `parseModel` accepted as it stands (a run's model snapshot is the checked
 * model's JSON text, stored when the run started): validating it again finds nothing, so `createShortCircuitSolver`
 * does not. Any other model — a scenario applied to it is a new object — is validated as usual.
 */
export function markCheckedModel(model: Model): void {
  checkedModels.add(model);
}

function throwIfInvalid(model: Model): void {
  if (checkedModels.has(model)) return;
  const issues = validateModel(model);
  if (issues.length > 0) throw new InvalidModelError(issues);
}

interface TieTree {
  /** Buses of multi-bus tie groups, children before parents. */
  postOrder: number[];
  /** Parent bus in the tie tree (−1 at a group's root). */
  parentBus: Int32Array;
  /** Tie index joining a bus to its parent (−1 at a root). */
  parentTie: Int32Array;
  /** 1 for buses in a group of two or more buses. */
  inGroup: Uint8Array;
}

function buildTieTree(network: Network): TieTree {
  const nBus = network.busIds.length;
  const adjacency: [tie: number, other: number][][] = Array.from({ length: nBus }, () => []);
  network.ties.forEach((t, i) => {
    if (!t.closed) return;
    adjacency[t.fromBus].push([i, t.toBus]);
    adjacency[t.toBus].push([i, t.fromBus]);
  });
  const parentBus = new Int32Array(nBus).fill(-1);
  const parentTie = new Int32Array(nBus).fill(-1);
  const inGroup = new Uint8Array(nBus);
  const visited = new Uint8Array(nBus);
  const postOrder: number[] = [];
  for (let root = 0; root < nBus; root += 1) {
    if (visited[root] || adjacency[root].length === 0) continue;
    const bfs = [root];
    visited[root] = 1;
    for (let h = 0; h < bfs.length; h += 1) {
      const b = bfs[h];
      inGroup[b] = 1;
      for (const [tie, other] of adjacency[b]) {
        if (visited[other]) continue;
        visited[other] = 1;
        parentBus[other] = b;
        parentTie[other] = tie;
        bfs.push(other);
      }
    }
    for (let h = bfs.length - 1; h >= 0; h -= 1) postOrder.push(bfs[h]);
  }
  return { postOrder, parentBus, parentTie, inGroup };
}

/**
 * Where a fault's current can flow. The graph: the network's nodes and the reference (ground), with an edge for each
 * series branch (ends on two nodes) and for each source or motor (node to reference). Its bridges split it into
 * 2-edge-connected components, which form a tree (the bridge tree) rooted at the reference's component. Current from
 * the sources to a fault at node k flows only in the components on the tree path from k's component to the root and
 * in the bridges between them; a component off that path is joined to it at one point and carries none.
 */
interface CarryStructure {
  /** Component of each vertex (nodes 0…n−1, the reference n). */
  comp: Int32Array;
  /** Parent component in the bridge tree (−1 at the root). */
  parentComp: Int32Array;
  /** Edge joining a component to its parent (−1 at the root). */
  parentBridge: Int32Array;
  /** Edges inside each component (CSR). Edge e < branch count: branch e; otherwise injection e − branch count. */
  compEdgeStart: Int32Array;
  compEdges: Int32Array;
  /** Nodes of each component (CSR; the reference left out). */
  compNodeStart: Int32Array;
  compNodes: Int32Array;
  /** Parent of each node in the elimination tree of the factor (−1 at a root). */
  etreeParent: Int32Array;
}

function buildCarryStructure(network: Network, factor: LdltFactor): CarryStructure {
  const n = network.nodeCount;
  const ground = n;
  const vCount = n + 1;
  const nBranch = network.branches.length;
  const edgeCount = nBranch + network.injections.length;
  const ea = new Int32Array(edgeCount).fill(-1);
  const eb = new Int32Array(edgeCount).fill(-1);
  network.branches.forEach((br, k) => {
    if (br.fromNode === br.toNode) return;
    ea[k] = br.fromNode;
    eb[k] = br.toNode;
  });
  network.injections.forEach((s, k) => {
    ea[nBranch + k] = s.node;
    eb[nBranch + k] = ground;
  });
  const degree = new Int32Array(vCount + 1);
  for (let e = 0; e < edgeCount; e += 1) {
    if (ea[e] < 0) continue;
    degree[ea[e] + 1] += 1;
    degree[eb[e] + 1] += 1;
  }
  for (let v = 0; v < vCount; v += 1) degree[v + 1] += degree[v];
  const adjStart = degree;
  const adjEdge = new Int32Array(adjStart[vCount]);
  const fill = adjStart.slice(0, vCount);
  for (let e = 0; e < edgeCount; e += 1) {
    if (ea[e] < 0) continue;
    adjEdge[fill[ea[e]]++] = e;
    adjEdge[fill[eb[e]]++] = e;
  }
  const other = (e: number, v: number) => (ea[e] === v ? eb[e] : ea[e]);

  // Bridges: iterative depth-first search with low links (parallel edges told apart by edge index).
  const disc = new Int32Array(vCount).fill(-1);
  const low = new Int32Array(vCount);
  const parentEdge = new Int32Array(vCount).fill(-1);
  const cursor = adjStart.slice(0, vCount);
  const isBridge = new Uint8Array(edgeCount);
  const stack = new Int32Array(vCount);
  let time = 0;
  for (let root = 0; root < vCount; root += 1) {
    if (disc[root] >= 0) continue;
    let top = 0;
    stack[0] = root;
    disc[root] = low[root] = time++;
    while (top >= 0) {
      const v = stack[top];
      if (cursor[v] < adjStart[v + 1]) {
        const e = adjEdge[cursor[v]++];
        if (e === parentEdge[v]) continue;
        const w = other(e, v);
        if (disc[w] < 0) {
          disc[w] = low[w] = time++;
          parentEdge[w] = e;
          stack[++top] = w;
        } else if (disc[w] < low[v]) low[v] = disc[w];
      } else {
        top -= 1;
        const pe = parentEdge[v];
        if (pe >= 0) {
          const u = other(pe, v);
          if (low[v] < low[u]) low[u] = low[v];
          if (low[v] > disc[u]) isBridge[pe] = 1;
        }
      }
    }
  }

  // Components: flood fill over the edges that are not bridges.
  const comp = new Int32Array(vCount).fill(-1);
  let compCount = 0;
  for (let start = 0; start < vCount; start += 1) {
    if (comp[start] >= 0) continue;
    const c = compCount++;
    comp[start] = c;
    let top = 0;
    stack[0] = start;
    while (top >= 0) {
      const v = stack[top--];
      for (let a = adjStart[v]; a < adjStart[v + 1]; a += 1) {
        const e = adjEdge[a];
        if (isBridge[e]) continue;
        const w = other(e, v);
        if (comp[w] < 0) {
          comp[w] = c;
          stack[++top] = w;
        }
      }
    }
  }
  const compEdgeStart = new Int32Array(compCount + 1);
  const compNodeStart = new Int32Array(compCount + 1);
  for (let e = 0; e < edgeCount; e += 1) if (ea[e] >= 0 && !isBridge[e]) compEdgeStart[comp[ea[e]] + 1] += 1;
  for (let v = 0; v < n; v += 1) compNodeStart[comp[v] + 1] += 1;
  for (let c = 0; c < compCount; c += 1) {
    compEdgeStart[c + 1] += compEdgeStart[c];
    compNodeStart[c + 1] += compNodeStart[c];
  }
  const compEdges = new Int32Array(compEdgeStart[compCount]);
  const compNodes = new Int32Array(compNodeStart[compCount]);
  const edgeFill = compEdgeStart.slice(0, compCount);
  const nodeFill = compNodeStart.slice(0, compCount);
  for (let e = 0; e < edgeCount; e += 1) if (ea[e] >= 0 && !isBridge[e]) compEdges[edgeFill[comp[ea[e]]]++] = e;
  for (let v = 0; v < n; v += 1) compNodes[nodeFill[comp[v]]++] = v;

  // The bridge tree, rooted at the reference's component (breadth first over the bridges).
  const parentComp = new Int32Array(compCount).fill(-1);
  const parentBridge = new Int32Array(compCount).fill(-1);
  const seen = new Uint8Array(compCount);
  const queue = new Int32Array(vCount);
  let head = 0;
  let tail = 0;
  queue[tail++] = ground;
  seen[comp[ground]] = 1;
  const visited = new Uint8Array(vCount);
  visited[ground] = 1;
  while (head < tail) {
    const v = queue[head++];
    for (let a = adjStart[v]; a < adjStart[v + 1]; a += 1) {
      const e = adjEdge[a];
      const w = other(e, v);
      if (visited[w]) continue;
      visited[w] = 1;
      queue[tail++] = w;
      if (isBridge[e] && !seen[comp[w]]) {
        seen[comp[w]] = 1;
        parentComp[comp[w]] = comp[v];
        parentBridge[comp[w]] = e;
      }
    }
  }

  // Elimination tree: the parent of a pivot is the first-eliminated node of its column of L.
  const { pos, order, colPtr, rowNode } = factor;
  const etreeParent = new Int32Array(n).fill(-1);
  for (let s = 0; s < n; s += 1) {
    let best = -1;
    for (let e = colPtr[s]; e < colPtr[s + 1]; e += 1) {
      const i = rowNode[e];
      if (best < 0 || pos[i] < pos[best]) best = i;
    }
    etreeParent[order[s]] = best;
  }
  return { comp, parentComp, parentBridge, compEdgeStart, compEdges, compNodeStart, compNodes, etreeParent };
}

function direction(
  phasorRe: number,
  phasorIm: number,
  magnitude: number,
  ref: Complex,
  refMagnitude: number,
): FlowDirection {
  if (!(magnitude > NEGLIGIBLE_SHARE * refMagnitude)) return 'none';
  // In-phase component with the fault current: Re(I · conj(I_f)).
  return phasorRe * ref.re + phasorIm * ref.im >= 0 ? 'from-to' : 'to-from';
}

/**
 * Builds the network, checks the model (`validateModel`; an invalid model throws EngineError 'invalid-input'
 * naming the first problem's path), factors Ybus once and computes the all-bus summary.
 */
export function createShortCircuitSolver(model: Model): ShortCircuitSolver {
  throwIfInvalid(model);
  const network = buildNetwork(model);
  const factor: LdltFactor = factorComplexSymmetric(buildAdmittanceMatrix(network));
  const zDiag = factor.inverseDiagonal();
  const { prefaultPu, busIds, busKv, busBaseA, busNode } = network;

  const buses: BusShortCircuit[] = busIds.map((id, b) => {
    const node = busNode[b];
    const zr = zDiag.re[node];
    const zi = zDiag.im[node];
    const zMag = Math.hypot(zr, zi);
    const currentA = (prefaultPu / zMag) * busBaseA[b];
    if (!(zMag > 0) || !Number.isFinite(currentA) || !Number.isFinite(zi / zr)) {
      throw new EngineError(
        'out-of-range',
        'non-finite-result',
        `fault current at bus "${id}" is not finite`,
        `buses[${b}]`,
      );
    }
    return { id, nominalKv: busKv[b], boltedFaultKa: currentA / 1000, xr: zi / zr };
  });
  const result: ShortCircuitResult = { prefaultPu, buses, warnings: network.warnings };

  const { branches: netBranches, injections: netInjections, ties: netTies } = network;
  // Look-up tables for `faultAt`, built on first use (the all-bus summary does not need them).
  let lookups:
    | {
        bus: Map<string, number>;
        branch: Map<string, number>;
        tie: Map<string, number>;
        injection: Map<string, number>;
      }
    | undefined;
  const index = () =>
    (lookups ??= {
      bus: new Map(busIds.map((id, i) => [id, i])),
      branch: new Map(netBranches.map((br, i) => [br.id, i])),
      tie: new Map(netTies.map((t, i) => [t.id, i])),
      injection: new Map(netInjections.map((s, i) => [s.id, i])),
    });
  let tieTree: TieTree | undefined;

  /** Indices of the requested elements (all when `ids` is undefined); unknown ids throw. */
  const pick = (
    ids: readonly string[] | undefined,
    count: number,
    byId: Map<string, number>,
    field: string,
  ): number[] => {
    if (ids === undefined) return Array.from({ length: count }, (_, i) => i);
    const out: number[] = [];
    for (const id of ids) {
      const i = byId.get(id);
      if (i !== undefined) out.push(i);
      else if (!(field === 'branchIds' && index().tie.has(id))) {
        throw new EngineError('invalid-input', 'unknown-reference', `unknown element "${id}"`, field);
      }
    }
    return out;
  };

  function faultAt(busId: string, options: FaultOptions = {}): BusFault {
    const b = index().bus.get(busId);
    if (b === undefined) throw new EngineError('invalid-input', 'unknown-bus', `unknown bus "${busId}"`, 'busId');
    const node = busNode[b];
    const column = factor.inverseColumn(node);
    const zkk: Complex = { re: column.re[node], im: column.im[node] };
    const zkkMag2 = zkk.re * zkk.re + zkk.im * zkk.im;
    // I_f = V / Z_kk (pu)
    const fault: Complex = { re: (prefaultPu * zkk.re) / zkkMag2, im: (-prefaultPu * zkk.im) / zkkMag2 };
    const faultMag = cAbs(fault);
    if (!Number.isFinite(faultMag) || !(faultMag > 0)) {
      throw new EngineError(
        'out-of-range',
        'non-finite-result',
        `fault current at bus "${busId}" is not finite`,
        'busId',
      );
    }
    // ΔV_i = −Z_ik · I_f (in place over the column)
    const dvRe = column.re;
    const dvIm = column.im;
    for (let i = 0; i < network.nodeCount; i += 1) {
      const zr = dvRe[i];
      const zi = dvIm[i];
      dvRe[i] = -(zr * fault.re - zi * fault.im);
      dvIm[i] = -(zr * fault.im + zi * fault.re);
    }
    const faultPhasorA = { re: fault.re * busBaseA[b], im: fault.im * busBaseA[b] };

    // Series branch currents, pu on the to side, positive from → to: I = y · (ΔV_from / t − ΔV_to); I/t on the from side.
    const nBranch = netBranches.length;
    const sRe = new Float64Array(nBranch);
    const sIm = new Float64Array(nBranch);
    for (let k = 0; k < nBranch; k += 1) {
      const br = netBranches[k];
      if (br.fromNode === br.toNode) continue;
      const ur = dvRe[br.fromNode] / br.ratio - dvRe[br.toNode];
      const ui = dvIm[br.fromNode] / br.ratio - dvIm[br.toNode];
      sRe[k] = br.admittancePu.re * ur - br.admittancePu.im * ui;
      sIm[k] = br.admittancePu.re * ui + br.admittancePu.im * ur;
    }
    // Source and motor currents into their bus, amperes: (E − V)/z = −ΔV · y.
    const nInj = netInjections.length;
    const gRe = new Float64Array(nInj);
    const gIm = new Float64Array(nInj);
    for (let k = 0; k < nInj; k += 1) {
      const s = netInjections[k];
      const vr = dvRe[s.node];
      const vi = dvIm[s.node];
      const base = busBaseA[s.bus];
      gRe[k] = -(s.admittancePu.re * vr - s.admittancePu.im * vi) * base;
      gIm[k] = -(s.admittancePu.re * vi + s.admittancePu.im * vr) * base;
    }

    const branches: BranchFaultCurrent[] = [];
    for (const k of pick(options.branchIds, nBranch, index().branch, 'branchIds')) {
      const br = netBranches[k];
      const fromA = busBaseA[br.fromBus] / br.ratio;
      const toA = busBaseA[br.toBus];
      const fromPhasorA = { re: sRe[k] * fromA, im: sIm[k] * fromA };
      const toPhasorA = { re: sRe[k] * toA, im: sIm[k] * toA };
      const dir = direction(sRe[k], sIm[k], Math.hypot(sRe[k], sIm[k]), fault, faultMag);
      branches.push({
        id: br.id,
        kind: br.kind,
        fromBus: busIds[br.fromBus],
        toBus: busIds[br.toBus],
        fromCurrentA: Math.hypot(fromPhasorA.re, fromPhasorA.im),
        toCurrentA: Math.hypot(toPhasorA.re, toPhasorA.im),
        fromPhasorA,
        toPhasorA,
        direction: dir,
        towardBus: dir === 'none' ? null : dir === 'from-to' ? busIds[br.toBus] : busIds[br.fromBus],
      });
    }

    const injections: InjectionFaultCurrent[] = pick(options.injectionIds, nInj, index().injection, 'injectionIds').map(
      (k) => {
        const s = netInjections[k];
        const phasorA = { re: gRe[k], im: gIm[k] };
        return { id: s.id, kind: s.kind, bus: busIds[s.bus], currentA: Math.hypot(gRe[k], gIm[k]), phasorA };
      },
    );

    const wantedTies =
      options.branchIds === undefined
        ? netTies.map((_, i) => i)
        : options.branchIds.flatMap((id) => (index().tie.has(id) ? [index().tie.get(id)!] : []));
    if (wantedTies.length > 0) {
      const tieCurrents = tieCurrentsA(b, faultPhasorA, sRe, sIm, gRe, gIm);
      for (const i of wantedTies) {
        branches.push(tieFaultCurrent(i, tieCurrents.get(i) ?? { re: 0, im: 0 }, faultPhasorA));
      }
    }

    return faultRow(buses[b], prefaultPu, faultMag * busBaseA[b], faultPhasorA, branches, injections);
  }

  /** The row of a closed tie carrying `phasor` (the same current at both ends), with its direction of flow. */
  function tieFaultCurrent(i: number, phasor: Phasor, faultPhasorA: Phasor): BranchFaultCurrent {
    const tie = netTies[i];
    const magnitude = Math.hypot(phasor.re, phasor.im);
    const dir = direction(phasor.re, phasor.im, magnitude, faultPhasorA, cAbs(faultPhasorA));
    return {
      id: tie.id,
      kind: 'tie',
      fromBus: busIds[tie.fromBus],
      toBus: busIds[tie.toBus],
      fromCurrentA: magnitude,
      toCurrentA: magnitude,
      fromPhasorA: phasor,
      toPhasorA: { ...phasor },
      direction: dir,
      towardBus: dir === 'none' ? null : dir === 'from-to' ? busIds[tie.toBus] : busIds[tie.fromBus],
    };
  }

  const work = { faults: 0, nodeVisits: 0, elementVisits: 0 };
  let carry: CarryStructure | undefined;
  let scratch: { re: Float64Array; im: Float64Array; mark: Int32Array; stamp: number } | undefined;
  /** Buses of each tied group in the tie tree's post order, by node (built on first use). */
  let groupBuses: Map<number, number[]> | undefined;

  function faultPath(busId: string): BusFault {
    const b = index().bus.get(busId);
    if (b === undefined) throw new EngineError('invalid-input', 'unknown-bus', `unknown bus "${busId}"`, 'busId');
    const cs = (carry ??= buildCarryStructure(network, factor));
    const sc = (scratch ??= {
      re: new Float64Array(network.nodeCount),
      im: new Float64Array(network.nodeCount),
      mark: new Int32Array(network.nodeCount),
      stamp: 0,
    });
    const stamp = ++sc.stamp;
    const { re, im, mark } = sc;
    const node = busNode[b];
    const nBranch = netBranches.length;

    // The elements that can carry current: the components on the bridge-tree path to the reference, and the bridges.
    const edgeList: number[] = [];
    const nodeList: number[] = [];
    for (let c = cs.comp[node]; c >= 0; c = cs.parentComp[c]) {
      for (let a = cs.compEdgeStart[c]; a < cs.compEdgeStart[c + 1]; a += 1) edgeList.push(cs.compEdges[a]);
      for (let a = cs.compNodeStart[c]; a < cs.compNodeStart[c + 1]; a += 1) nodeList.push(cs.compNodes[a]);
      if (cs.parentBridge[c] >= 0) edgeList.push(cs.parentBridge[c]);
    }
    edgeList.sort((x, y) => x - y);

    // The nodes whose voltage is needed, with their elimination-tree ancestors (the back substitution reads those).
    const solveNodes: number[] = [];
    for (const v of nodeList) {
      for (let p = v; p >= 0 && mark[p] !== stamp; p = cs.etreeParent[p]) {
        mark[p] = stamp;
        solveNodes.push(factor.pos[p]);
      }
    }
    const steps = Int32Array.from(solveNodes).sort();
    // Column `node` of Zbus at those nodes (the unit-vector solve restricted to them).
    factor.inverseColumnAt(node, cs.etreeParent, steps, re, im);
    const { order } = factor;
    work.faults += 1;
    work.nodeVisits += steps.length;
    work.elementVisits += edgeList.length;

    const zkk: Complex = { re: re[node], im: im[node] };
    const zkkMag2 = zkk.re * zkk.re + zkk.im * zkk.im;
    const fault: Complex = { re: (prefaultPu * zkk.re) / zkkMag2, im: (-prefaultPu * zkk.im) / zkkMag2 };
    const faultMag = cAbs(fault);
    if (!Number.isFinite(faultMag) || !(faultMag > 0)) {
      for (const s of steps) re[order[s]] = im[order[s]] = 0;
      throw new EngineError(
        'out-of-range',
        'non-finite-result',
        `fault current at bus "${busId}" is not finite`,
        'busId',
      );
    }
    // ΔV_i = −Z_ik · I_f at the solved nodes.
    for (const s of steps) {
      const i = order[s];
      const zr = re[i];
      const zi = im[i];
      re[i] = -(zr * fault.re - zi * fault.im);
      im[i] = -(zr * fault.im + zi * fault.re);
    }
    const faultPhasorA = { re: fault.re * busBaseA[b], im: fault.im * busBaseA[b] };

    const branches: BranchFaultCurrent[] = [];
    const injections: InjectionFaultCurrent[] = [];
    const flows: { bus: number; re: number; im: number }[] = [];
    for (const e of edgeList) {
      if (e < nBranch) {
        const br = netBranches[e];
        const ur = re[br.fromNode] / br.ratio - re[br.toNode];
        const ui = im[br.fromNode] / br.ratio - im[br.toNode];
        const sr = br.admittancePu.re * ur - br.admittancePu.im * ui;
        const si = br.admittancePu.re * ui + br.admittancePu.im * ur;
        const fromA = busBaseA[br.fromBus] / br.ratio;
        const toA = busBaseA[br.toBus];
        const fromPhasorA = { re: sr * fromA, im: si * fromA };
        const toPhasorA = { re: sr * toA, im: si * toA };
        const dir = direction(sr, si, Math.hypot(sr, si), fault, faultMag);
        branches.push({
          id: br.id,
          kind: br.kind,
          fromBus: busIds[br.fromBus],
          toBus: busIds[br.toBus],
          fromCurrentA: Math.hypot(fromPhasorA.re, fromPhasorA.im),
          toCurrentA: Math.hypot(toPhasorA.re, toPhasorA.im),
          fromPhasorA,
          toPhasorA,
          direction: dir,
          towardBus: dir === 'none' ? null : dir === 'from-to' ? busIds[br.toBus] : busIds[br.fromBus],
        });
        flows.push({ bus: br.fromBus, re: -fromPhasorA.re, im: -fromPhasorA.im });
        flows.push({ bus: br.toBus, re: sr * toA, im: si * toA });
      } else {
        const s = netInjections[e - nBranch];
        const vr = re[s.node];
        const vi = im[s.node];
        const base = busBaseA[s.bus];
        const gr = -(s.admittancePu.re * vr - s.admittancePu.im * vi) * base;
        const gi = -(s.admittancePu.re * vi + s.admittancePu.im * vr) * base;
        injections.push({
          id: s.id,
          kind: s.kind,
          bus: busIds[s.bus],
          currentA: Math.hypot(gr, gi),
          phasorA: { re: gr, im: gi },
        });
        flows.push({ bus: s.bus, re: gr, im: gi });
      }
    }
    for (const s of steps) re[order[s]] = im[order[s]] = 0;

    // Ties inside the nodes of the path (the tie tree of each tied group, as in `faultAt`).
    if (netTies.length > 0) {
      const tree = tieTree ?? (tieTree = buildTieTree(network));
      if (!groupBuses) {
        groupBuses = new Map();
        for (const bus of tree.postOrder) {
          const list = groupBuses.get(busNode[bus]) ?? [];
          list.push(bus);
          groupBuses.set(busNode[bus], list);
        }
      }
      const groups = nodeList.filter((v) => groupBuses!.has(v));
      if (groups.length > 0) {
        const net = new Map<number, { re: number; im: number }>();
        const at = (bus: number) => net.get(bus) ?? net.set(bus, { re: 0, im: 0 }).get(bus)!;
        for (const f of flows) {
          if (!tree.inGroup[f.bus]) continue;
          const x = at(f.bus);
          x.re += f.re;
          x.im += f.im;
        }
        if (tree.inGroup[b]) {
          const x = at(b);
          x.re -= faultPhasorA.re;
          x.im -= faultPhasorA.im;
        }
        const tieOut: [number, Phasor][] = [];
        for (const g of groups) {
          for (const bus of groupBuses.get(g)!) {
            const parent = tree.parentBus[bus];
            if (parent < 0) continue;
            const tieIndex = tree.parentTie[bus];
            const sign = netTies[tieIndex].fromBus === bus ? 1 : -1;
            const x = at(bus);
            tieOut.push([tieIndex, { re: sign * x.re, im: sign * x.im }]);
            const y = at(parent);
            y.re += x.re;
            y.im += x.im;
          }
        }
        tieOut.sort((x, y) => x[0] - y[0]);
        for (const [i, phasor] of tieOut) {
          branches.push(tieFaultCurrent(i, phasor, faultPhasorA));
        }
      }
    }

    return faultRow(buses[b], prefaultPu, faultMag * busBaseA[b], faultPhasorA, branches, injections);
  }

  /**
   * Tie currents (amperes, positive from → to) by Kirchhoff's current law on the tie tree of each group of
   * tied buses, from the leaves up: a bus passes to its parent everything entering it and its subtree
   * (branches, sources, motors) less the fault current drawn there.
   */
  function tieCurrentsA(
    faultBus: number,
    faultPhasorA: Phasor,
    sRe: Float64Array,
    sIm: Float64Array,
    gRe: Float64Array,
    gIm: Float64Array,
  ): Map<number, Phasor> {
    const tree = tieTree ?? (tieTree = buildTieTree(network));
    const out = new Map<number, Phasor>();
    if (tree.postOrder.length === 0) return out;
    const netRe = new Float64Array(busIds.length);
    const netIm = new Float64Array(busIds.length);
    netBranches.forEach((br, k) => {
      if (tree.inGroup[br.fromBus]) {
        const a = busBaseA[br.fromBus] / br.ratio;
        netRe[br.fromBus] -= sRe[k] * a;
        netIm[br.fromBus] -= sIm[k] * a;
      }
      if (tree.inGroup[br.toBus]) {
        const a = busBaseA[br.toBus];
        netRe[br.toBus] += sRe[k] * a;
        netIm[br.toBus] += sIm[k] * a;
      }
    });
    netInjections.forEach((s, k) => {
      if (tree.inGroup[s.bus]) {
        netRe[s.bus] += gRe[k];
        netIm[s.bus] += gIm[k];
      }
    });
    if (tree.inGroup[faultBus]) {
      netRe[faultBus] -= faultPhasorA.re;
      netIm[faultBus] -= faultPhasorA.im;
    }
    for (const bus of tree.postOrder) {
      const parent = tree.parentBus[bus];
      if (parent < 0) continue;
      const tieIndex = tree.parentTie[bus];
      const sign = netTies[tieIndex].fromBus === bus ? 1 : -1;
      out.set(tieIndex, { re: sign * netRe[bus], im: sign * netIm[bus] });
      netRe[parent] += netRe[bus];
      netIm[parent] += netIm[bus];
    }
    return out;
  }

  return { result, busIds, faultAt, faultPath, work };
}

/**
 * Bolted three-phase fault at every bus: symmetrical rms current (kA) and X/R at the fault.
 * With `includeFaults`, also every branch, source and motor current for a fault at each bus
 * (one solve per bus: prefer `createShortCircuitSolver(model).faultAt(busId)` for the buses you need).
 */
export function shortCircuit(model: Model): ShortCircuitResult;
export function shortCircuit(
  model: Model,
  options: { includeFaults: true },
): ShortCircuitResult & { faults: BusFault[] };
export function shortCircuit(
  model: Model,
  options?: { includeFaults?: boolean },
): ShortCircuitResult & { faults?: BusFault[] } {
  const solver = createShortCircuitSolver(model);
  if (!options?.includeFaults) return solver.result;
  return { ...solver.result, faults: solver.busIds.map((id) => solver.faultAt(id)) };
}

/** One bus's fault, from its summary row. Written out rather than spread: a spread followed by more keys makes a slow
 * object (same keys, same order). */
function faultRow(
  summary: { id: string; nominalKv: number; boltedFaultKa: number; xr: number },
  prefaultPu: number,
  faultCurrentA: number,
  faultPhasorA: Complex,
  branches: BusFault['branches'],
  injections: BusFault['injections'],
): BusFault {
  return {
    id: summary.id,
    nominalKv: summary.nominalKv,
    boltedFaultKa: summary.boltedFaultKa,
    xr: summary.xr,
    prefaultPu,
    faultCurrentA,
    faultPhasorA,
    branches,
    injections,
  };
}
