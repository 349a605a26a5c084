/**
 * Sparse LDLᵀ factorization of a complex symmetric matrix (the bus admittance matrix), with a minimum-degree
 * elimination order, and the selected inverse (Takahashi equations) that gives every diagonal entry of
 * Zbus = Ybus⁻¹ at the cost of one factorization.
 *
 * Numerical note: Ybus is complex symmetric (not Hermitian). Every element here is a series R + jX with
 * R > 0 (or a shunt of the same kind), so the real part of Ybus is positive definite once a source ties the
 * network to the reference; Gaussian elimination without pivoting is then stable and never meets a zero pivot.
 * A zero or non-finite pivot still raises an EngineError.
 *
 * Ordering: greedy minimum degree on the elimination graph (ties broken by node index, so results are
 * deterministic). On a radial network it eliminates leaves first: zero fill-in, linear time.
 *
 * References: Tinney & Walker, "Direct solutions of sparse network equations by optimally ordered triangular
 * factorization" (Proc. IEEE, 1967) for the ordering; Takahashi, Fagan & Chin (1973) for the sparse inverse
 * subset Z = D⁻¹L⁻¹ + (I − Lᵀ)Z.
 */
import { EngineError } from '../errors';

/** One off-diagonal entry, shared by row i and row j of the symmetric matrix (updated once for both). */
interface Entry {
  re: number;
  im: number;
}

/** Accumulates a complex symmetric matrix: diagonal plus off-diagonal entries (each stored once, shared). */
export class ComplexSymmetricBuilder {
  readonly n: number;
  readonly diagRe: Float64Array;
  readonly diagIm: Float64Array;
  readonly rows: Map<number, Entry>[];

  constructor(n: number) {
    this.n = n;
    this.diagRe = new Float64Array(n);
    this.diagIm = new Float64Array(n);
    this.rows = Array.from({ length: n }, () => new Map<number, Entry>());
  }

  addDiagonal(i: number, re: number, im: number): void {
    this.diagRe[i] += re;
    this.diagIm[i] += im;
  }

  /** Adds (re + j·im) to entries (i, j) and (j, i), i ≠ j. */
  addOffDiagonal(i: number, j: number, re: number, im: number): void {
    const existing = this.rows[i].get(j);
    if (existing) {
      existing.re += re;
      existing.im += im;
      return;
    }
    const entry: Entry = { re, im };
    this.rows[i].set(j, entry);
    this.rows[j].set(i, entry);
  }
}

/** Binary min-heap of (degree, node) pairs with lazy deletion; ties broken by node index. */
class DegreeHeap {
  private keys: number[] = [];
  private nodes: number[] = [];
  /** Key of the pair removed by the last `pop`. */
  poppedKey = 0;

  get size(): number {
    return this.keys.length;
  }

  push(key: number, node: number): void {
    const keys = this.keys;
    const nodes = this.nodes;
    let i = keys.length;
    keys.push(key);
    nodes.push(node);
    while (i > 0) {
      const parent = (i - 1) >> 1;
      const pk = keys[parent];
      if (pk < key || (pk === key && nodes[parent] < node)) break;
      keys[i] = pk;
      nodes[i] = nodes[parent];
      i = parent;
    }
    keys[i] = key;
    nodes[i] = node;
  }

  /** Removes the smallest pair; returns its node (its key in `poppedKey`). */
  pop(): number {
    const keys = this.keys;
    const nodes = this.nodes;
    const topNode = nodes[0];
    this.poppedKey = keys[0];
    const key = keys.pop()!;
    const node = nodes.pop()!;
    const n = keys.length;
    if (n > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= n) break;
        const r = l + 1;
        let m = l;
        if (r < n && (keys[r] < keys[l] || (keys[r] === keys[l] && nodes[r] < nodes[l]))) m = r;
        if (key < keys[m] || (key === keys[m] && node < nodes[m])) break;
        keys[i] = keys[m];
        nodes[i] = nodes[m];
        i = m;
      }
      keys[i] = key;
      nodes[i] = node;
    }
    return topNode;
  }
}

/** A = L·D·Lᵀ with L unit lower triangular in elimination order. Vectors are indexed by node. */
export class LdltFactor {
  readonly n: number;
  /** order[step] = node eliminated at that step. */
  readonly order: Int32Array;
  /** pos[node] = step at which the node was eliminated. */
  readonly pos: Int32Array;
  readonly dRe: Float64Array;
  readonly dIm: Float64Array;
  /** Column `step` of L: entries colPtr[step] … colPtr[step+1]−1, row nodes in rowNode, values lRe/lIm. */
  readonly colPtr: Int32Array;
  readonly rowNode: Int32Array;
  readonly lRe: Float64Array;
  readonly lIm: Float64Array;

  constructor(p: {
    order: Int32Array;
    dRe: Float64Array;
    dIm: Float64Array;
    colPtr: Int32Array;
    rowNode: Int32Array;
    lRe: Float64Array;
    lIm: Float64Array;
  }) {
    this.n = p.order.length;
    this.order = p.order;
    this.pos = new Int32Array(this.n);
    for (let s = 0; s < this.n; s += 1) this.pos[p.order[s]] = s;
    this.dRe = p.dRe;
    this.dIm = p.dIm;
    this.colPtr = p.colPtr;
    this.rowNode = p.rowNode;
    this.lRe = p.lRe;
    this.lIm = p.lIm;
  }

  /** Number of stored off-diagonal entries of L (fill-in included). */
  get nonZeros(): number {
    return this.rowNode.length;
  }

  /** Solves A·x = b in place (b given as real and imaginary parts, indexed by node); returns x = b's arrays. */
  solveInPlace(re: Float64Array, im: Float64Array): void {
    const { n, order, colPtr, rowNode, lRe, lIm, dRe, dIm } = this;
    // L·v = b
    for (let s = 0; s < n; s += 1) {
      const p = order[s];
      const vr = re[p];
      const vi = im[p];
      if (vr === 0 && vi === 0) continue;
      for (let e = colPtr[s]; e < colPtr[s + 1]; e += 1) {
        const i = rowNode[e];
        re[i] -= lRe[e] * vr - lIm[e] * vi;
        im[i] -= lRe[e] * vi + lIm[e] * vr;
      }
    }
    // D·w = v
    for (let s = 0; s < n; s += 1) {
      const p = order[s];
      const den = dRe[s] * dRe[s] + dIm[s] * dIm[s];
      const vr = re[p];
      const vi = im[p];
      re[p] = (vr * dRe[s] + vi * dIm[s]) / den;
      im[p] = (vi * dRe[s] - vr * dIm[s]) / den;
    }
    // Lᵀ·x = w
    for (let s = n - 1; s >= 0; s -= 1) {
      const p = order[s];
      let xr = re[p];
      let xi = im[p];
      for (let e = colPtr[s]; e < colPtr[s + 1]; e += 1) {
        const i = rowNode[e];
        xr -= lRe[e] * re[i] - lIm[e] * im[i];
        xi -= lRe[e] * im[i] + lIm[e] * re[i];
      }
      re[p] = xr;
      im[p] = xi;
    }
  }

  /**
   * Column `node` of A⁻¹ (for Ybus: the Zbus column of the faulted bus).
   */
  inverseColumn(node: number): { re: Float64Array; im: Float64Array } {
    const re = new Float64Array(this.n);
    const im = new Float64Array(this.n);
    re[node] = 1;
    this.solveInPlace(re, im);
    return { re, im };
  }

  /**
   * Column `node` of A⁻¹ at some nodes only, in place (re, im all zero on entry): the operations of `solveInPlace` on
   * the unit vector, restricted to the elimination path of `node` (forward; `parent` is the elimination tree) and to
   * `steps`, the sorted elimination steps of the wanted nodes with all their ancestors (backward).
   */
  inverseColumnAt(
    node: number,
    parent: Int32Array | readonly number[],
    steps: Int32Array,
    re: Float64Array,
    im: Float64Array,
  ): void {
    const { order, pos, colPtr, rowNode, lRe, lIm, dRe, dIm } = this;
    re[node] = 1;
    for (let p = node; p >= 0; p = parent[p]) {
      const s = pos[p];
      const vr = re[p];
      const vi = im[p];
      if (vr === 0 && vi === 0) continue;
      for (let e = colPtr[s]; e < colPtr[s + 1]; e += 1) {
        const i = rowNode[e];
        re[i] -= lRe[e] * vr - lIm[e] * vi;
        im[i] -= lRe[e] * vi + lIm[e] * vr;
      }
    }
    for (let p = node; p >= 0; p = parent[p]) {
      const s = pos[p];
      const den = dRe[s] * dRe[s] + dIm[s] * dIm[s];
      const vr = re[p];
      const vi = im[p];
      re[p] = (vr * dRe[s] + vi * dIm[s]) / den;
      im[p] = (vi * dRe[s] - vr * dIm[s]) / den;
    }
    for (let q = steps.length - 1; q >= 0; q -= 1) {
      const s = steps[q];
      const p = order[s];
      let xr = re[p];
      let xi = im[p];
      for (let e = colPtr[s]; e < colPtr[s + 1]; e += 1) {
        const i = rowNode[e];
        xr -= lRe[e] * re[i] - lIm[e] * im[i];
        xi -= lRe[e] * im[i] + lIm[e] * re[i];
      }
      re[p] = xr;
      im[p] = xi;
    }
  }

  /**
   * Diagonal of A⁻¹ by the Takahashi equations, computed over the pattern of L (no full inverse):
   * for the pivot p of step s with column pattern S,
   *   Z(p, j) = −Σ_{i∈S} L(i, p)·Z(i, j)   for j ∈ S,
   *   Z(p, p) = 1/d(s) − Σ_{i∈S} L(i, p)·Z(i, p).
   * Every Z(i, j) needed has i, j ∈ S, a clique of the filled graph eliminated later, so it is already known.
   */
  inverseDiagonal(): { re: Float64Array; im: Float64Array } {
    const { n, order, pos, colPtr, rowNode, lRe, lIm, dRe, dIm } = this;
    const zDiagRe = new Float64Array(n);
    const zDiagIm = new Float64Array(n);
    const zOffRe = new Float64Array(rowNode.length);
    const zOffIm = new Float64Array(rowNode.length);
    const columnMaps = new Map<number, Map<number, number>>();

    /** Index e of entry (other, node of step s) in column s of L. */
    const entryIndex = (s: number, other: number): number => {
      const start = colPtr[s];
      const end = colPtr[s + 1];
      if (end - start <= 12) {
        for (let e = start; e < end; e += 1) if (rowNode[e] === other) return e;
        return -1;
      }
      let map = columnMaps.get(s);
      if (!map) {
        map = new Map();
        for (let e = start; e < end; e += 1) map.set(rowNode[e], e);
        columnMaps.set(s, map);
      }
      return map.get(other) ?? -1;
    };

    for (let s = n - 1; s >= 0; s -= 1) {
      const p = order[s];
      const start = colPtr[s];
      const end = colPtr[s + 1];
      for (let e = start; e < end; e += 1) {
        const j = rowNode[e];
        let accRe = 0;
        let accIm = 0;
        for (let f = start; f < end; f += 1) {
          const i = rowNode[f];
          let zr: number;
          let zi: number;
          if (i === j) {
            zr = zDiagRe[i];
            zi = zDiagIm[i];
          } else {
            const si = pos[i];
            const sj = pos[j];
            const k = si < sj ? entryIndex(si, j) : entryIndex(sj, i);
            if (k < 0) {
              throw new EngineError('out-of-range', 'solver-structure', 'internal error: fill pattern is not closed');
            }
            zr = zOffRe[k];
            zi = zOffIm[k];
          }
          accRe += lRe[f] * zr - lIm[f] * zi;
          accIm += lRe[f] * zi + lIm[f] * zr;
        }
        zOffRe[e] = -accRe;
        zOffIm[e] = -accIm;
      }
      const den = dRe[s] * dRe[s] + dIm[s] * dIm[s];
      let zr = dRe[s] / den;
      let zi = -dIm[s] / den;
      for (let e = start; e < end; e += 1) {
        zr -= lRe[e] * zOffRe[e] - lIm[e] * zOffIm[e];
        zi -= lRe[e] * zOffIm[e] + lIm[e] * zOffRe[e];
      }
      zDiagRe[p] = zr;
      zDiagIm[p] = zi;
    }
    return { re: zDiagRe, im: zDiagIm };
  }
}

/**
 * Factors the accumulated matrix (consumes the builder's rows). Right-looking elimination in minimum-degree
 * order: eliminating pivot p with remaining neighbours S updates a(i, j) −= a(i, p)·a(p, j)/d for i, j ∈ S
 * (creating fill where a(i, j) was zero) and stores L(i, p) = a(i, p)/d.
 */
export function factorComplexSymmetric(builder: ComplexSymmetricBuilder): LdltFactor {
  const { n, diagRe, diagIm, rows } = builder;
  const eliminated = new Uint8Array(n);
  const heap = new DegreeHeap();
  for (let i = 0; i < n; i += 1) heap.push(rows[i].size, i);

  const order = new Int32Array(n);
  const dRe = new Float64Array(n);
  const dIm = new Float64Array(n);
  const colPtr = new Int32Array(n + 1);
  const rowNode: number[] = [];
  const lRe: number[] = [];
  const lIm: number[] = [];
  // Scratch: the pivot row's entries a(p, i).
  let aRe = new Float64Array(16);
  let aIm = new Float64Array(16);

  for (let step = 0; step < n; step += 1) {
    let p = -1;
    while (heap.size > 0) {
      const node = heap.pop();
      if (!eliminated[node] && heap.poppedKey === rows[node].size) {
        p = node;
        break;
      }
    }
    if (p < 0)
      throw new EngineError('out-of-range', 'solver-structure', 'internal error: elimination order incomplete');
    eliminated[p] = 1;
    order[step] = p;

    const pr = diagRe[p];
    const pi = diagIm[p];
    const den = pr * pr + pi * pi;
    if (!(den > 0) || !Number.isFinite(den)) {
      throw new EngineError(
        'out-of-range',
        'singular-network',
        'the network admittance matrix cannot be factored (zero or non-finite pivot): ' +
          'a part of the network has no path to a source, or an impedance is extreme',
      );
    }
    dRe[step] = pr;
    dIm[step] = pi;

    const row = rows[p];
    const neighbours = Array.from(row.keys());
    const k = neighbours.length;
    if (k > aRe.length) {
      aRe = new Float64Array(2 * k);
      aIm = new Float64Array(2 * k);
    }
    const colStart = rowNode.length;
    colPtr[step] = colStart;
    for (let t = 0; t < k; t += 1) {
      const entry = row.get(neighbours[t])!;
      aRe[t] = entry.re;
      aIm[t] = entry.im;
      // L(i, p) = a(i, p) / d
      rowNode.push(neighbours[t]);
      lRe.push((entry.re * pr + entry.im * pi) / den);
      lIm.push((entry.im * pr - entry.re * pi) / den);
    }
    for (let t = 0; t < k; t += 1) {
      const i = neighbours[t];
      const ri = rows[i];
      ri.delete(p);
      const li = colStart + t;
      // a(i, i) −= L(i, p)·a(p, i)
      diagRe[i] -= lRe[li] * aRe[t] - lIm[li] * aIm[t];
      diagIm[i] -= lRe[li] * aIm[t] + lIm[li] * aRe[t];
      for (let u = t + 1; u < k; u += 1) {
        const j = neighbours[u];
        // a(i, j) −= L(i, p)·a(p, j)
        const ur = lRe[li] * aRe[u] - lIm[li] * aIm[u];
        const ui = lRe[li] * aIm[u] + lIm[li] * aRe[u];
        const existing = ri.get(j);
        if (existing) {
          existing.re -= ur;
          existing.im -= ui;
        } else {
          const entry: Entry = { re: -ur, im: -ui };
          ri.set(j, entry);
          rows[j].set(i, entry);
        }
      }
    }
    row.clear();
    for (let t = 0; t < k; t += 1) heap.push(rows[neighbours[t]].size, neighbours[t]);
  }
  colPtr[n] = rowNode.length;

  return new LdltFactor({
    order,
    dRe,
    dIm,
    colPtr,
    rowNode: Int32Array.from(rowNode),
    lRe: Float64Array.from(lRe),
    lIm: Float64Array.from(lIm),
  });
}
