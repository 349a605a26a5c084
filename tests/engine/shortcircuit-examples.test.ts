import { expectClose } from '../helpers/approx';
import { modelSchema, type Model, type ModelInput } from '../../shared/schemas/model';
import {
  createShortCircuitSolver,
  shortCircuit,
  transformerFullLoadCurrentA,
  transformerInfiniteBusFaultCurrentA,
} from '../../server/engine/shortcircuit';

/*
 * Worked examples first. Sources, as the project reference states them:
 * - transformer on an infinite bus, I = I_FLA × 100/%Z, and the point-to-point worked example (300 kVA, 2 %Z,
 *   208 V): the Point-to-Point Method of Short-Circuit Calculation (published reprint);
 * - the per-unit example (1500 kVA, 500 MVA utility, 4 × 500 kcmil Cu): COMPUTED in the reference with the
 *   IEEE 141 per-unit formulas, not taken from a publication.
 */

type Body = Omit<ModelInput, 'format' | 'version'>;
const makeModel = (body: Body): Model => modelSchema.parse({ format: 'emberline-model', version: 1, ...body });

/** An "infinite" primary: 1e9 MVA is 10⁻⁷ of a 100 MVA base, far below any transformer here. */
const INFINITE_MVA = 1e9;

function transformerOnInfiniteBus(kva: number, secondaryKv: number, impedancePct: number, xr = 6): Model {
  return makeModel({
    buses: [
      { id: 'PRI', nominalKv: 12.47 },
      { id: 'SEC', nominalKv: secondaryKv },
    ],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: INFINITE_MVA, xr: 10 }],
    transformers: [{ id: 'TX', fromBus: 'PRI', toBus: 'SEC', kva, primaryKv: 12.47, secondaryKv, impedancePct, xr }],
  });
}

const busKa = (result: { buses: { id: string; boltedFaultKa: number; xr: number }[] }, id: string) => {
  const bus = result.buses.find((b) => b.id === id);
  if (!bus) throw new Error(`no bus ${id}`);
  return bus;
};

describe('worked example: transformer on an infinite bus', () => {
  it('1500 kVA, 5.75 %Z, 480 V gives I_FLA × 100/%Z = 31 378 A', () => {
    // Point-to-point method (published reprint): I_sc = I_FLA × 100/%Z, I_FLA = kVA·1000/(√3·E_LL).
    expectClose(transformerFullLoadCurrentA(1500, 0.48), (1500 * 1000) / (1.732 * 480), 2e-4); // 1.732 as printed
    // 31 378 A: the reference's per-unit example, "infinite_bus_check_A" (COMPUTED there, from the same formula).
    expectClose(transformerInfiniteBusFaultCurrentA(1500, 0.48, 5.75), 31378, 2e-5);
    const result = shortCircuit(transformerOnInfiniteBus(1500, 0.48, 5.75));
    expectClose(busKa(result, 'SEC').boltedFaultKa * 1000, 31378, 2e-5);
  });

  it.each([
    [75, 0.208, 2.0],
    [300, 0.208, 4.5],
    [750, 0.48, 5.75],
    [2500, 0.48, 5.75],
    [5000, 4.16, 6.5],
  ])('%s kVA, %s kV, %s %%Z: I = I_FLA × 100/%%Z at the secondary, for any X/R', (kva, kv, z) => {
    // Point-to-point method (published reprint): I_sc = I_FLA × 100/%Z on an infinite primary;
    // the magnitude of Z, hence I, does not depend on its X/R.
    const expectedA = ((kva * 1000) / (Math.sqrt(3) * kv * 1000)) * (100 / z);
    for (const xr of [1.5, 6, 20]) {
      const result = shortCircuit(transformerOnInfiniteBus(kva, kv, z, xr));
      expectClose(busKa(result, 'SEC').boltedFaultKa * 1000, expectedA, 1e-6);
      // X/R at the secondary is the transformer's own (the source is negligible): IEEE 141 per-unit practice.
      expectClose(busKa(result, 'SEC').xr, xr, 1e-5);
    }
  });
});

describe('worked example: point-to-point method, 300 kVA, 2 %Z, 208 V', () => {
  // Published example: 300 kVA, 2 %Z, 3-phase, 120/208 V, infinite primary. The example takes %Z reduced by 10 %
  // (2 % → 1.8 %, worst-case impedance tolerance): I_FLA = 833 A, multiplier 100/1.8 = 55.55, I_sca = 46 273 A.
  // Fault 1: 20 ft of 2 sets of 500 kcmil Cu in steel conduit: f = 0.174, M = 0.852, I = 46 273 × 0.852 = 39 425 A.
  const build = (xr: number) =>
    makeModel({
      buses: [
        { id: 'PRI', nominalKv: 12.47 },
        { id: 'SEC', nominalKv: 0.208 },
        { id: 'F1', nominalKv: 0.208 },
      ],
      sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: INFINITE_MVA, xr: 10 }],
      transformers: [
        {
          id: 'TX',
          fromBus: 'PRI',
          toBus: 'SEC',
          kva: 300,
          primaryKv: 12.47,
          secondaryKv: 0.208,
          impedancePct: 1.8,
          xr,
        },
      ],
      cables: [
        {
          id: 'RUN',
          fromBus: 'SEC',
          toBus: 'F1',
          lengthM: 20 * 0.3048,
          sets: 2,
          size: '500kcmil',
          material: 'Cu',
          conduit: 'steel',
        },
      ],
    });

  it('46 273 A at the transformer secondary', () => {
    // Published: I_FLA 833 A × 55.55 = 46 273 A. The published intermediate values are rounded (833 for 832.7 A,
    // 55.55 for 55.556), which moves the product by 0.024 %: tolerance 0.1 %.
    expectClose(transformerFullLoadCurrentA(300, 0.208), 833, 1e-3);
    const result = shortCircuit(build(4));
    expectClose(busKa(result, 'SEC').boltedFaultKa * 1000, 46273, 1e-3);
  });

  it('about 39 425 A after 20 ft of 2 × 500 kcmil Cu in steel conduit (point-to-point is an approximation)', () => {
    // Published: f = 1.732·20·46 273/(22 185·2·208) = 0.174, M = 1/(1+f) = 0.852, I = 46 273 × 0.852 = 39 425 A.
    // Tolerance 5 %, because the point-to-point method differs from this engine in three stated ways:
    //  1. it adds the cable's impedance magnitude to the transformer's arithmetically ("slightly conservative",
    //     per the method's own derivation), where the engine adds R and X as phasors;
    //  2. its conductor constant C = 22 185 A·ft/V means |Z| = 0.0451 Ω per 1000 ft, while NEC Chapter 9 Table 9
    //     gives R 0.029 + jX 0.048 Ω per 1000 ft (|Z| = 0.0561) for 500 kcmil Cu in steel conduit;
    //  3. the example does not state the transformer's X/R (it does not need it); X/R from 2 to 10 is tried here.
    // Together these put the engine 2–3.5 % below the published value; both effects make the point-to-point value
    // the higher one, so the engine must also not exceed it (beyond the 0.1 % rounding of the published inputs).
    for (const xr of [2, 3, 4.5, 6, 10]) {
      const ia = busKa(shortCircuit(build(xr)), 'F1').boltedFaultKa * 1000;
      expectClose(ia, 39425, 0.05);
      expect(ia).toBeLessThan(39425 * 1.001);
    }
  });
});

describe('worked example: per-unit method (COMPUTED in the reference, not published)', () => {
  // Reference "per_unit_example": status COMPUTED (not from a publication), formulas per IEEE 141 practice.
  // Inputs: 1 MVA base, 0.48 kV; utility 500 MVA, X/R 15; transformer 1500 kVA, 5.75 %Z, X/R 6;
  // cable 100 ft, 4 × 500 kcmil Cu per phase in steel conduit (NEC Table 9: R 0.029, X 0.048 Ω/1000 ft).
  // Printed results: 29 829 A and X/R 6.186 at the secondary; 26 134 A and X/R 4.698 at the end of the cable.
  // The per-unit values are printed to 4 significant figures: tolerance 0.02 % on currents, 0.05 % on X/R.
  const model = makeModel({
    buses: [
      { id: 'SWGR', nominalKv: 12.47 },
      { id: 'SEC', nominalKv: 0.48 },
      { id: 'END', nominalKv: 0.48 },
    ],
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'SWGR', shortCircuitMva: 500, xr: 15 }],
    transformers: [
      {
        id: 'TX',
        fromBus: 'SWGR',
        toBus: 'SEC',
        kva: 1500,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
    ],
    cables: [
      {
        id: 'FDR',
        fromBus: 'SEC',
        toBus: 'END',
        lengthM: 100 * 0.3048,
        sets: 4,
        size: '500',
        material: 'Cu',
        conduit: 'steel',
      },
    ],
  });

  it('29 829 A, X/R 6.186 at the secondary; 26 134 A, X/R 4.698 at the cable end', () => {
    const result = shortCircuit(model);
    expectClose(busKa(result, 'SEC').boltedFaultKa * 1000, 29829, 2e-4);
    expectClose(busKa(result, 'SEC').xr, 6.186, 5e-4);
    expectClose(busKa(result, 'END').boltedFaultKa * 1000, 26134, 2e-4);
    expectClose(busKa(result, 'END').xr, 4.698, 5e-4);
  });

  it('the utility bus sees its own short-circuit MVA: I = MVA / (√3·kV), X/R 15', () => {
    // IEEE 141 per-unit practice (reference formulas): utility Zpu = MVA_base/MVA_sc, I_base = MVA/(√3·kV).
    const result = shortCircuit(model);
    expectClose(busKa(result, 'SWGR').boltedFaultKa, 500 / (Math.sqrt(3) * 12.47), 1e-6);
    expectClose(busKa(result, 'SWGR').xr, 15, 1e-6);
  });

  it('the detailed fault gives the same current as the all-bus summary, and the cable carries all of it', () => {
    // Series circuit: one path, so the cable and the transformer secondary carry the whole fault current
    // (Kirchhoff's current law); the summary (Zbus diagonal) and the detailed solve (Zbus column) agree.
    const solver = createShortCircuitSolver(model);
    const fault = solver.faultAt('END');
    expectClose(fault.faultCurrentA, busKa(solver.result, 'END').boltedFaultKa * 1000, 1e-9);
    const fdr = fault.branches.find((b) => b.id === 'FDR')!;
    expectClose(fdr.toCurrentA, fault.faultCurrentA, 1e-9);
    expect(fdr.direction).toBe('from-to');
    expect(fdr.towardBus).toBe('END');
  });
});
