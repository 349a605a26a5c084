import { expectClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import {
  baseCurrentA,
  baseImpedanceOhm,
  cableImpedanceFromPerKmOhm,
  cableImpedanceFromTableOhm,
  changeOfBaseFactor,
  generatorImpedancePu,
  motorFirstCycleMultiplier,
  motorImpedancePu,
  motorSubtransientPu,
  necTable9ImpedanceOhmPer1000Ft,
  offNominalRatio,
  ohmsToPu,
  shortCircuitMvaFromKa,
  splitImpedanceByXr,
  transformerImpedancePu,
  typicalTransformerXr,
  TYPICAL_TRANSFORMER_XR,
  utilityImpedancePu,
} from '../../server/engine/shortcircuit';
import { normalizeConductorSize } from '../../shared/schemas/model';

/*
 * Element impedances. The per-unit values below are the reference's per-unit example (COMPUTED there with the
 * IEEE 141 per-unit formulas, not published): 1 MVA base, 0.48 kV; printed to 4 significant figures.
 */

describe('worked example: per-unit element values (COMPUTED in the reference)', () => {
  it('bases: Zbase = kV²/MVA = 0.2304 Ω, Ibase = MVA/(√3·kV) = 1202.8 A', () => {
    // IEEE 141 per-unit practice (reference per_unit_example formulas); printed values.
    expectClose(baseImpedanceOhm(0.48, 1), 0.2304, 1e-9);
    expectClose(baseCurrentA(0.48, 1), 1202.8, 5e-5);
  });

  it('utility 500 MVA, X/R 15: Zpu = 0.000133 + j0.001996', () => {
    // Reference per_unit_example: utility_Zpu = MVA_base/MVA_sc, split R = |Z|/√(1+(X/R)²), X = R·(X/R).
    const z = utilityImpedancePu(500, 15, 1);
    // Printed to 4 significant figures (6 decimals): tolerance half a unit of the last printed digit.
    expectClose(z.re, 0.000133, 0.0000005 / 0.000133);
    expectClose(z.im, 0.001996, 0.0000005 / 0.001996);
  });

  it('transformer 1500 kVA, 5.75 %Z, X/R 6: Zpu = 0.006302 + j0.037812', () => {
    // Reference per_unit_example: transformer_Zpu = (%Z/100)·(MVA_base/MVA_tx), split by X/R.
    const z = transformerImpedancePu({
      ratingKva: 1500,
      impedancePct: 5.75,
      xr: 6,
      ratedSecondaryKv: 0.48,
      baseSecondaryKv: 0.48,
      baseMva: 1,
    });
    expectClose(z.re, 0.006302, 1e-4);
    expectClose(z.im, 0.037812, 1e-4);
  });

  it('cable 100 ft, 4 × 500 kcmil Cu in steel conduit: Zpu = 0.003147 + j0.005208', () => {
    // Reference per_unit_example: Z_ohm = (R + jX) per 1000 ft × L/1000 / n (NEC Chapter 9 Table 9: R 0.029, X 0.048).
    const zOhm = cableImpedanceFromTableOhm({
      size: '500kcmil',
      material: 'Cu',
      conduit: 'steel',
      lengthM: 30.48,
      sets: 4,
      frequencyHz: 60,
    });
    expectClose(zOhm.re, (0.029 * 0.1) / 4, 1e-9);
    expectClose(zOhm.im, (0.048 * 0.1) / 4, 1e-9);
    const z = ohmsToPu(zOhm, 0.48, 1);
    expectClose(z.re, 0.003147, 2e-4);
    expectClose(z.im, 0.005208, 2e-4);
  });
});

describe('NEC Chapter 9 Table 9 (copied into server/engine/data/nec-ch9-table9.json)', () => {
  it.each([
    // [size, material, conduit, R, X] — NEC (NFPA 70) Chapter 9 Table 9, ohm to neutral per 1000 ft, 75 °C, 60 Hz.
    ['500', 'Cu', 'steel', 0.029, 0.048],
    ['500', 'Cu', 'pvc', 0.027, 0.039],
    ['500', 'Al', 'aluminum', 0.048, 0.039],
    ['4/0', 'Al', 'pvc', 0.1, 0.041],
    ['12', 'Cu', 'steel', 2.0, 0.068],
    ['1000', 'Cu', 'steel', 0.018, 0.046],
    // 1/0 Cu in aluminum conduit: 0.13 in two published copies (one copy prints 0.12, possibly another edition).
    ['1/0', 'Cu', 'aluminum', 0.13, 0.044],
  ] as const)('%s %s in %s conduit: R %s, X %s', (size, material, conduit, r, x) => {
    const z = necTable9ImpedanceOhmPer1000Ft(size, material, conduit);
    expectClose(z.rOhmPer1000Ft, r, 1e-12);
    expectClose(z.xOhmPer1000Ft, x, 1e-12);
  });

  it('XL is the same for copper and aluminum; PVC and aluminum conduit share one XL column', () => {
    // NEC Chapter 9 Table 9 layout (reference notes).
    for (const size of ['6', '2/0', '350', '750']) {
      const cuPvc = necTable9ImpedanceOhmPer1000Ft(size, 'Cu', 'pvc');
      const alPvc = necTable9ImpedanceOhmPer1000Ft(size, 'Al', 'pvc');
      const cuAlu = necTable9ImpedanceOhmPer1000Ft(size, 'Cu', 'aluminum');
      expectClose(alPvc.xOhmPer1000Ft, cuPvc.xOhmPer1000Ft, 1e-12);
      expectClose(cuAlu.xOhmPer1000Ft, cuPvc.xOhmPer1000Ft, 1e-12);
    }
  });

  it('14 AWG aluminum is not in the table: an error naming the field', () => {
    // NEC Chapter 9 Table 9 lists no 14 AWG aluminum conductor.
    expect(() => necTable9ImpedanceOhmPer1000Ft('14', 'Al', 'steel')).toThrow(EngineError);
    try {
      necTable9ImpedanceOhmPer1000Ft('14', 'Al', 'steel');
    } catch (error) {
      expect((error as EngineError).field).toBe('size');
      expect((error as EngineError).kind).toBe('invalid-input');
    }
  });

  it('conductor sizes in the usual spellings', () => {
    expect(normalizeConductorSize('500kcmil')).toBe('500');
    expect(normalizeConductorSize('500 MCM')).toBe('500');
    expect(normalizeConductorSize('#2')).toBe('2');
    expect(normalizeConductorSize('2 AWG')).toBe('2');
    expect(normalizeConductorSize('0000')).toBe('4/0');
    expect(normalizeConductorSize('4/0 AWG')).toBe('4/0');
    expect(normalizeConductorSize('3/8')).toBeNull();
    expect(normalizeConductorSize('2000')).toBeNull();
  });

  it('n parallel sets divide R and X by n; length in metres converted to feet', () => {
    // NEC Chapter 9 Table 9 note (reference): for n parallel sets per phase divide R and X by n. 1 ft = 0.3048 m.
    const one = cableImpedanceFromTableOhm({
      size: '250',
      material: 'Cu',
      conduit: 'pvc',
      lengthM: 100,
      sets: 1,
      frequencyHz: 60,
    });
    const three = cableImpedanceFromTableOhm({
      size: '250',
      material: 'Cu',
      conduit: 'pvc',
      lengthM: 100,
      sets: 3,
      frequencyHz: 60,
    });
    expectClose(three.re, one.re / 3, 1e-12);
    expectClose(three.im, one.im / 3, 1e-12);
    expectClose(one.re, (0.052 * 100) / 0.3048 / 1000, 1e-12);
  });

  it('at 50 Hz the reactance is 50/60 of the table value, the resistance unchanged', () => {
    // X = 2πfL: the Table 9 reactances are stated for 60 Hz.
    const z60 = cableImpedanceFromTableOhm({
      size: '4/0',
      material: 'Cu',
      conduit: 'steel',
      lengthM: 50,
      sets: 1,
      frequencyHz: 60,
    });
    const z50 = cableImpedanceFromTableOhm({
      size: '4/0',
      material: 'Cu',
      conduit: 'steel',
      lengthM: 50,
      sets: 1,
      frequencyHz: 50,
    });
    expectClose(z50.im, (z60.im * 50) / 60, 1e-12);
    expectClose(z50.re, z60.re, 1e-12);
  });

  it('explicit R and X per km', () => {
    // Z = (r + jx)·L/n.
    const z = cableImpedanceFromPerKmOhm({ rOhmPerKm: 0.2, xOhmPerKm: 0.1, lengthM: 500, sets: 2 });
    expectClose(z.re, 0.05, 1e-12);
    expectClose(z.im, 0.025, 1e-12);
  });
});

describe('per-unit formulas', () => {
  it('impedance split by X/R keeps |Z| and X/R', () => {
    // IEEE 141 per-unit practice: R = |Z|/√(1+(X/R)²), X = R·(X/R).
    for (const xr of [0.5, 4, 15, 40]) {
      const z = splitImpedanceByXr(0.05, xr);
      expectClose(Math.hypot(z.re, z.im), 0.05, 1e-12);
      expectClose(z.im / z.re, xr, 1e-12);
    }
  });

  it('change of base: Zpu,new = Zpu,old·(MVAnew/MVAold)·(kVold/kVnew)²', () => {
    // Reference per_unit_example "change_of_base".
    expectClose(changeOfBaseFactor(1.5, 100, 0.48, 0.48), 100 / 1.5, 1e-12);
    expectClose(changeOfBaseFactor(1, 1, 0.46, 0.48), (0.46 / 0.48) ** 2, 1e-12);
  });

  it('short-circuit MVA from kA: MVA = √3·kV·kA', () => {
    // Reference per_unit_example: utility Zpu from kA, kV²/(√3·kV·I_sc) ohms.
    expectClose(shortCircuitMvaFromKa(13.8, 20), Math.sqrt(3) * 13.8 * 20, 1e-12);
  });

  it('generator: X = X"d on the machine rating, R = X/(X/R)', () => {
    // IEEE 141 per-unit practice, change of base to 100 MVA.
    const z = generatorImpedancePu({
      ratingKva: 2000,
      ratedKv: 0.48,
      subtransientPct: 15,
      xr: 20,
      baseMva: 100,
      baseKv: 0.48,
    });
    expectClose(z.im, 0.15 * (100 / 2), 1e-12);
    expectClose(z.im / z.re, 20, 1e-12);
  });

  it('off-nominal ratio is 1 at nominal ratings and follows the taps otherwise', () => {
    // Standard tap model: t = (kVp,rated/kVp,base)/(kVs,rated/kVs,base).
    expectClose(offNominalRatio(12.47, 12.47, 0.48, 0.48), 1, 1e-12);
    expectClose(offNominalRatio(12.16, 12.47, 0.48, 0.48), 12.16 / 12.47, 1e-12);
  });
});

describe('induction motors (IEEE 551-2006 Table 9-1 practice)', () => {
  it('X" = 16.7 % when none is given; 1/locked-rotor multiple; or the given X"%', () => {
    // IEEE 551-2006 Table 9-1: induction motor X" = 16.7 % (→ 6 × rated current); X" ≈ 1/LRC multiple.
    expectClose(motorSubtransientPu({}), 0.167, 1e-12);
    expectClose(motorSubtransientPu({ lockedRotorMultiple: 6.5 }), 1 / 6.5, 1e-12);
    expectClose(motorSubtransientPu({ subtransientPct: 20 }), 0.2, 1e-12);
  });

  it('first-cycle multipliers: 1.2 X" above 50 hp, 1.67 X" below, on low-voltage systems', () => {
    // IEEE 551-2006 Table 9-1 (LV first-cycle network); none above 1 kV (common practice, no source).
    expectClose(motorFirstCycleMultiplier(100, 0.48), 1.2, 1e-12);
    expectClose(motorFirstCycleMultiplier(50, 0.48), 1.2, 1e-12);
    expectClose(motorFirstCycleMultiplier(25, 0.48), 1.67, 1e-12);
    expectClose(motorFirstCycleMultiplier(1000, 4.16), 1.0, 1e-12);
  });

  it('motor impedance on the system base: X = multiplier·X"·(MVAbase/MVAmotor)·(kVm/kVbase)²', () => {
    // IEEE 551 practice with the IEEE 141 change of base.
    const z = motorImpedancePu({
      ratingKva: 200,
      ratedKv: 0.46,
      subtransientPu: 0.167,
      multiplier: 1.2,
      xr: 8,
      baseMva: 100,
      baseKv: 0.48,
    });
    expectClose(z.im, 1.2 * 0.167 * (100 / 0.2) * (0.46 / 0.48) ** 2, 1e-12);
    expectClose(z.im / z.re, 8, 1e-12);
  });
});

describe('typical transformer X/R (from memory, unverified; used only with a warning)', () => {
  it('returns the table rows at their ratings and stays between neighbours', () => {
    // from memory, unverified (reference "typical_values"): mid-range values of the rough ranges.
    for (const [kva, xr] of TYPICAL_TRANSFORMER_XR) expectClose(typicalTransformerXr(kva), xr, 1e-12);
    const mid = typicalTransformerXr(1200);
    expect(mid).toBeGreaterThan(typicalTransformerXr(1000));
    expect(mid).toBeLessThan(typicalTransformerXr(1500));
    expectClose(typicalTransformerXr(10), TYPICAL_TRANSFORMER_XR[0][1], 1e-12); // clamped below the table
    expectClose(typicalTransformerXr(50000), TYPICAL_TRANSFORMER_XR[TYPICAL_TRANSFORMER_XR.length - 1][1], 1e-12);
  });
});

describe('non-physical element values', () => {
  it('throw EngineError naming the field', () => {
    expect(() => utilityImpedancePu(0, 10, 100)).toThrow(EngineError);
    expect(() => utilityImpedancePu(500, Number.NaN, 100)).toThrow(/xr/);
    expect(() => cableImpedanceFromPerKmOhm({ rOhmPerKm: 0.2, xOhmPerKm: 0.1, lengthM: -5, sets: 1 })).toThrow(
      /lengthM/,
    );
    expect(() =>
      transformerImpedancePu({
        ratingKva: Infinity,
        impedancePct: 5,
        xr: 5,
        ratedSecondaryKv: 0.48,
        baseSecondaryKv: 0.48,
        baseMva: 100,
      }),
    ).toThrow(/kva/);
  });
});
