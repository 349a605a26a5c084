/**
 * Builds the per-unit network of a system model: nodes (buses joined by closed ties are one node), series
 * branches (transformers, cables) and shunt sources (utilities, generators, induction motors), and the bus
 * admittance matrix Ybus.
 *
 * Per unit on a common base: SYSTEM_BASE_MVA, and each bus's nominal kV as its voltage base.
 * Transformers are an ideal t:1 transformer (t = off-nominal ratio, 1 when ratings equal the bus voltages)
 * followed by the series impedance on the secondary side; their phase shift is ignored (a balanced
 * three-phase fault sees only magnitudes through it).
 */
import type { EngineWarning } from '../errors';
import { EngineError } from '../errors';
import type { Model } from '../../../shared/schemas/model';
import { Complex, cAbs, cInv, cIsFinite } from './complex';
import { ComplexSymmetricBuilder } from './sparse';
import {
  baseCurrentA,
  cableImpedanceFromPerKmOhm,
  cableImpedanceFromTableOhm,
  generatorImpedancePu,
  motorFirstCycleMultiplier,
  motorRpmAssumed,
  motorImpedancePu,
  motorKvaFromHp,
  motorSubtransientPu,
  offNominalRatio,
  ohmsToPu,
  shortCircuitMvaFromKa,
  transformerImpedancePu,
  typicalMotorXr,
  typicalTransformerXr,
  utilityImpedancePu,
} from './impedance';

/** System MVA base of the per-unit network. Results do not depend on it. */
export const SYSTEM_BASE_MVA = 100;

export type BranchKind = 'transformer' | 'cable' | 'tie';
export type InjectionKind = 'utility' | 'generator' | 'motor';

/** A series branch of the per-unit network. */
export interface NetworkBranch {
  id: string;
  kind: 'transformer' | 'cable';
  fromBus: number;
  toBus: number;
  fromNode: number;
  toNode: number;
  /** Series impedance, pu (secondary side for a transformer). */
  impedancePu: Complex;
  /** Series admittance 1/z, pu. */
  admittancePu: Complex;
  /** Off-nominal ratio t (1 for cables). */
  ratio: number;
}

/** A closed tie: its buses share one node. */
export interface NetworkTie {
  id: string;
  fromBus: number;
  toBus: number;
  closed: boolean;
}

/** A source or motor: an EMF of the pre-fault voltage behind an impedance, connected to a bus. */
export interface NetworkInjection {
  id: string;
  kind: InjectionKind;
  bus: number;
  node: number;
  impedancePu: Complex;
  admittancePu: Complex;
}

export interface Network {
  baseMva: number;
  prefaultPu: number;
  busIds: string[];
  busKv: Float64Array;
  /** Base current of each bus, A. */
  busBaseA: Float64Array;
  busNode: Int32Array;
  nodeCount: number;
  branches: NetworkBranch[];
  ties: NetworkTie[];
  injections: NetworkInjection[];
  warnings: EngineWarning[];
}

function checkFinite(z: Complex, collection: string, index: number, elementId: string): Complex {
  if (!cIsFinite(z) || cAbs(z) === 0) {
    throw new EngineError(
      'out-of-range',
      'non-finite-result',
      `impedance of "${elementId}" is not a finite non-zero value`,
      `${collection}[${index}]`,
    );
  }
  return z;
}

/** Builds the network of a model that passed `validateModel`. */
export function buildNetwork(model: Model): Network {
  const baseMva = SYSTEM_BASE_MVA;
  const prefaultPu = model.prefaultPu ?? 1.0;
  const frequencyHz = model.frequencyHz ?? 60;
  const warnings: EngineWarning[] = [];

  const busIds = model.buses.map((b) => b.id);
  const busIndex = new Map<string, number>(busIds.map((id, i) => [id, i]));
  const busOf = (id: string, collection: string, index: number, field: string): number => {
    const i = busIndex.get(id);
    if (i === undefined) {
      throw new EngineError(
        'invalid-input',
        'unknown-reference',
        `unknown bus "${id}"`,
        `${collection}[${index}].${field}`,
      );
    }
    return i;
  };
  const busKv = Float64Array.from(model.buses.map((b) => b.nominalKv));
  const busBaseA = Float64Array.from(model.buses.map((b) => baseCurrentA(b.nominalKv, baseMva)));

  // Closed ties merge buses into one node.
  const parent = Int32Array.from(busIds.map((_, i) => i));
  const find = (i: number): number => {
    let x = i;
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  };
  const ties: NetworkTie[] = (model.ties ?? []).map((t, i) => {
    const tie = {
      id: t.id,
      fromBus: busOf(t.fromBus, 'ties', i, 'fromBus'),
      toBus: busOf(t.toBus, 'ties', i, 'toBus'),
      closed: t.closed !== false,
    };
    if (tie.closed) parent[find(tie.fromBus)] = find(tie.toBus);
    return tie;
  });
  const rootNode = new Map<number, number>();
  const busNode = new Int32Array(busIds.length);
  for (let b = 0; b < busIds.length; b += 1) {
    const root = find(b);
    let node = rootNode.get(root);
    if (node === undefined) {
      node = rootNode.size;
      rootNode.set(root, node);
    }
    busNode[b] = node;
  }

  const branches: NetworkBranch[] = [];
  const typicalXr: string[] = [];
  (model.transformers ?? []).forEach((t, i) => {
    const fromBus = busOf(t.fromBus, 'transformers', i, 'fromBus');
    const toBus = busOf(t.toBus, 'transformers', i, 'toBus');
    let xr = t.xr;
    if (xr === undefined) {
      xr = typicalTransformerXr(t.kva);
      typicalXr.push(`"${t.id}" (${t.kva} kVA: X/R ${xr.toFixed(2)})`);
    }
    const z = checkFinite(
      transformerImpedancePu({
        ratingKva: t.kva,
        impedancePct: t.impedancePct,
        xr,
        ratedSecondaryKv: t.secondaryKv,
        baseSecondaryKv: busKv[toBus],
        baseMva,
      }),
      'transformers',
      i,
      t.id,
    );
    branches.push({
      id: t.id,
      kind: 'transformer',
      fromBus,
      toBus,
      fromNode: busNode[fromBus],
      toNode: busNode[toBus],
      impedancePu: z,
      admittancePu: cInv(z),
      ratio: offNominalRatio(t.primaryKv, busKv[fromBus], t.secondaryKv, busKv[toBus]),
    });
  });
  if (typicalXr.length > 0) {
    warnings.push({
      code: 'typical-transformer-xr',
      message:
        'Transformer X/R not given; a typical value by rating was used (not from a published table: enter the ' +
        `nameplate or test-report value) for ${typicalXr.join(', ')}`,
    });
  }

  let scaledReactance = false;
  (model.cables ?? []).forEach((c, i) => {
    const fromBus = busOf(c.fromBus, 'cables', i, 'fromBus');
    const toBus = busOf(c.toBus, 'cables', i, 'toBus');
    const sets = c.sets ?? 1;
    let zOhm: Complex;
    try {
      if (c.rOhmPerKm !== undefined && c.xOhmPerKm !== undefined) {
        zOhm = cableImpedanceFromPerKmOhm({ rOhmPerKm: c.rOhmPerKm, xOhmPerKm: c.xOhmPerKm, lengthM: c.lengthM, sets });
      } else if (c.size !== undefined && c.material !== undefined && c.conduit !== undefined) {
        zOhm = cableImpedanceFromTableOhm({
          size: c.size,
          material: c.material,
          conduit: c.conduit,
          lengthM: c.lengthM,
          sets,
          frequencyHz,
        });
        if (frequencyHz !== 60) scaledReactance = true;
      } else {
        throw new EngineError(
          'invalid-input',
          'missing-value',
          'give size, material and conduit, or rOhmPerKm and xOhmPerKm',
          'size',
        );
      }
    } catch (error) {
      if (error instanceof EngineError) {
        throw new EngineError(
          error.kind,
          error.code,
          `cable "${c.id}": ${error.message}`,
          `cables[${i}].${error.field ?? 'size'}`,
        );
      }
      throw error;
    }
    const z = checkFinite(ohmsToPu(zOhm, busKv[fromBus], baseMva), 'cables', i, c.id);
    branches.push({
      id: c.id,
      kind: 'cable',
      fromBus,
      toBus,
      fromNode: busNode[fromBus],
      toNode: busNode[toBus],
      impedancePu: z,
      admittancePu: cInv(z),
      ratio: 1,
    });
  });
  if (scaledReactance) {
    warnings.push({
      code: 'cable-reactance-frequency',
      message: `NEC Chapter 9 Table 9 reactances are for 60 Hz; they were scaled to ${frequencyHz} Hz (X proportional to frequency)`,
    });
  }

  const injections: NetworkInjection[] = [];
  (model.sources ?? []).forEach((s, i) => {
    const bus = busOf(s.bus, 'sources', i, 'bus');
    let z: Complex;
    if (s.kind === 'utility') {
      const mva = s.shortCircuitMva ?? shortCircuitMvaFromKa(busKv[bus], s.shortCircuitKa ?? Number.NaN);
      z = utilityImpedancePu(mva, s.xr, baseMva);
    } else {
      z = generatorImpedancePu({
        ratingKva: s.kva,
        ratedKv: s.kv,
        subtransientPct: s.subtransientPct,
        xr: s.xr,
        baseMva,
        baseKv: busKv[bus],
      });
    }
    checkFinite(z, 'sources', i, s.id);
    injections.push({ id: s.id, kind: s.kind, bus, node: busNode[bus], impedancePu: z, admittancePu: cInv(z) });
  });

  const hpAsKva: string[] = [];
  const motorTypicalXr: string[] = [];
  const rpmAssumed: string[] = [];
  (model.motors ?? []).forEach((m, i) => {
    const bus = busOf(m.bus, 'motors', i, 'bus');
    const ratingKva = m.kva ?? motorKvaFromHp(m.hp ?? Number.NaN);
    if (m.kva === undefined) hpAsKva.push(`"${m.id}"`);
    // Size class for IEEE 551 multipliers: hp, or kVA taken as hp (1 kVA per hp, common practice).
    const sizeHp = m.hp ?? ratingKva;
    if (m.firstCycleMultiplier === undefined && motorRpmAssumed(sizeHp, m.kv, m.rpm)) rpmAssumed.push(`"${m.id}"`);
    let xr = m.xr;
    if (xr === undefined) {
      xr = typicalMotorXr(m.kv);
      motorTypicalXr.push(`"${m.id}" (X/R ${xr})`);
    }
    const z = motorImpedancePu({
      ratingKva,
      ratedKv: m.kv,
      subtransientPu: motorSubtransientPu(m),
      multiplier: m.firstCycleMultiplier ?? motorFirstCycleMultiplier(sizeHp, m.kv, m.rpm),
      xr,
      baseMva,
      baseKv: busKv[bus],
    });
    checkFinite(z, 'motors', i, m.id);
    injections.push({ id: m.id, kind: 'motor', bus, node: busNode[bus], impedancePu: z, admittancePu: cInv(z) });
  });
  if (hpAsKva.length > 0) {
    warnings.push({
      code: 'motor-kva-from-hp',
      message: `Motor kVA taken as 1 kVA per hp (common practice, no source) for ${hpAsKva.join(', ')}`,
    });
  }
  if (rpmAssumed.length > 0) {
    warnings.push({
      code: 'motor-rpm-assumed',
      message: `Motor speed not given: taken as 3600 rpm (first-cycle multiplier 1.0, the larger contribution, IEEE C37.010 practice) for ${rpmAssumed.join(', ')}`,
    });
  }
  if (motorTypicalXr.length > 0) {
    warnings.push({
      code: 'typical-motor-xr',
      message: `Motor X/R not given; a typical value was used (not from a published table) for ${motorTypicalXr.join(', ')}`,
    });
  }

  return {
    baseMva,
    prefaultPu,
    busIds,
    busKv,
    busBaseA,
    busNode,
    nodeCount: rootNode.size,
    branches,
    ties,
    injections,
    warnings,
  };
}

/**
 * Bus admittance matrix of the network (node-indexed).
 * Series branch a→b with admittance y and ratio t: Y(a,a) += y/t², Y(b,b) += y, Y(a,b) = Y(b,a) −= y/t.
 * Shunt (source or motor impedance to the reference): Y(n,n) += 1/z.
 * Branches whose ends are one node (in parallel with a closed tie) carry no current and are left out.
 */
export function buildAdmittanceMatrix(network: Network): ComplexSymmetricBuilder {
  const y = new ComplexSymmetricBuilder(network.nodeCount);
  for (const b of network.branches) {
    if (b.fromNode === b.toNode) continue;
    const { re, im } = b.admittancePu;
    const t = b.ratio;
    y.addDiagonal(b.fromNode, re / (t * t), im / (t * t));
    y.addDiagonal(b.toNode, re, im);
    y.addOffDiagonal(b.fromNode, b.toNode, -re / t, -im / t);
  }
  for (const s of network.injections) {
    y.addDiagonal(s.node, s.admittancePu.re, s.admittancePu.im);
  }
  return y;
}
