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

function throwIfInvalid(model: Model): void {
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
        const tie = netTies[i];
        const phasor = tieCurrents.get(i) ?? { re: 0, im: 0 };
        const magnitude = Math.hypot(phasor.re, phasor.im);
        const dir = direction(phasor.re, phasor.im, magnitude, faultPhasorA, cAbs(faultPhasorA));
        branches.push({
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
        });
      }
    }

    return {
      ...buses[b],
      prefaultPu,
      faultCurrentA: faultMag * busBaseA[b],
      faultPhasorA,
      branches,
      injections,
    };
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

  return { result, busIds, faultAt };
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
