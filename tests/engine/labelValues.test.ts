import { expectClose } from '../helpers/approx';
import { EngineError } from '../../server/engine/errors';
import { computeIncidentEnergy } from '../../server/engine/ieee1584';
import {
  DEFAULT_PPE_LEVELS,
  computeLabelValues,
  gloveClass,
  minimumArcRatingCalPerCm2,
  noAdequatePpe,
  shockApproachBoundaries,
  signalWord,
  sitePpeLevel,
} from '../../server/engine/labelValues';
import { CAUTIONS, NO_ADEQUATE_PPE_CAUTION } from '../../shared/cautions';

function engineError(fn: () => unknown): EngineError {
  try {
    fn();
  } catch (e) {
    if (e instanceof EngineError) return e;
    throw e;
  }
  throw new Error('expected an EngineError');
}

/** A result with a given incident energy (only the fields the label needs). */
function resultWith(calPerCm2: number) {
  return {
    incidentEnergyCalPerCm2: calPerCm2,
    incidentEnergyJPerCm2: calPerCm2 * 4.184,
    arcFlashBoundaryMm: 1500,
    workingDistanceMm: 457.2,
    governingCase: 'full' as const,
  };
}

describe('worked example: label values of IEEE 1584-2018 Annex D.1 at 4.16 kV', () => {
  // Result of the Annex D.1 inputs (3.19 cal/cm², reduced case; see ieee1584.test.ts)
  const r = computeIncidentEnergy({
    voltageV: 4160,
    boltedFaultKa: 15,
    electrodeConfig: 'VCB',
    gapMm: 104,
    workingDistanceMm: 914.4,
    enclosureMm: { height: 1143, width: 762, depth: 254 },
    clearingMs: { full: 197, reduced: 223 },
  });
  const label = computeLabelValues(r, 4160);

  it('carries the governing energy, boundary and case', () => {
    expectClose(label.incidentEnergyCalPerCm2, r.incidentEnergyCalPerCm2, 1e-15);
    expectClose(label.arcFlashBoundaryMm, r.arcFlashBoundaryMm, 1e-15);
    expect(label.governingCase).toBe('reduced');
  });

  it('rounds 3.19 cal/cm² up to a minimum arc rating of 4 cal/cm² (common practice, no source)', () => {
    expect(label.minimumArcRatingCalPerCm2).toBe(4);
    expect(label.minimumArcRatingBasis).toContain('common practice');
  });

  it('puts it in the default PPE level 1 (≤ 4 cal/cm²; common practice, no source), WARNING, no "no adequate PPE"', () => {
    expect(label.ppeLevel?.name).toBe('PPE level 1');
    expect(label.signalWord).toBe('WARNING'); // default rule: DANGER above 40 cal/cm² (common practice, no source)
    expect(label.signalColor).toBe('safety orange'); // ANSI Z535.4: WARNING in safety orange
    expect(label.noAdequatePpe).toBe(false);
    expect(label.cautions).toEqual([...CAUTIONS]);
  });

  it('takes the 751 V-5 kV row of NFPA 70E Table 130.4(E)(a) and glove class 1', () => {
    // NFPA 70E Table 130.4(E)(a), 751 V-5 kV: limited approach 3.0 m (10 ft 0 in) movable, 1.5 m (5 ft 0 in) fixed;
    // restricted approach 0.7 m (2 ft 2 in) — this row from memory, unverified
    expect(label.shockApproach?.range).toBe('751 V-5 kV');
    expect(label.shockApproach?.limitedApproachMovable.ftIn).toBe('10 ft 0 in');
    expect(label.shockApproach?.limitedApproachFixed.ftIn).toBe('5 ft 0 in');
    expect(label.shockApproach?.restrictedApproach.ftIn).toBe('2 ft 2 in');
    // ASTM D120 class 1: maximum use voltage 7.5 kV AC (from memory, unverified)
    expect(label.gloveClass?.class).toBe('1');
  });
});

describe('shock approach boundaries, NFPA 70E Table 130.4(E)(a) (AC, phase to phase)', () => {
  it('480 V: limited 3 ft 6 in (fixed), restricted 1 ft 0 in (read in a published copy)', () => {
    // NFPA 70E Table 130.4(E)(a), 151 V-750 V row: fixed-part limited approach 3 ft 6 in and restricted approach
    // 1 ft 0 in read in a published copy; 10 ft 0 in movable and the metric values from memory
    const b = shockApproachBoundaries(480);
    expect(b?.range).toBe('151 V-750 V');
    expect(b?.limitedApproachFixed.ftIn).toBe('3 ft 6 in');
    expect(b?.restrictedApproach.ftIn).toBe('1 ft 0 in');
    expect(b?.limitedApproachMovable.ftIn).toBe('10 ft 0 in');
    expectClose(b?.limitedApproachFixed.m ?? NaN, 1.0, 1e-12);
    expectClose(b?.restrictedApproach.m ?? NaN, 0.3, 1e-12);
    expectClose(b?.limitedApproachFixed.imperialMm ?? NaN, 42 * 25.4, 1e-12); // 3 ft 6 in = 42 in
  });

  it('208 V and 600 V fall in the same 151 V-750 V row', () => {
    // NFPA 70E Table 130.4(E)(a) row limits (from memory)
    expect(shockApproachBoundaries(208)?.range).toBe('151 V-750 V');
    expect(shockApproachBoundaries(600)?.range).toBe('151 V-750 V');
  });

  it('13.8 kV: limited 5 ft 0 in (fixed), restricted 2 ft 2 in (read in a published copy)', () => {
    // NFPA 70E Table 130.4(E)(a), 5.1 kV-15 kV row: 5 ft 0 in and 2 ft 2 in read in a published copy
    const b = shockApproachBoundaries(13800);
    expect(b?.range).toBe('5.1 kV-15 kV');
    expect(b?.limitedApproachFixed.ftIn).toBe('5 ft 0 in');
    expect(b?.restrictedApproach.ftIn).toBe('2 ft 2 in');
    expect(b?.limitedApproachMovable.ftIn).toBe('10 ft 0 in');
  });

  it('120 V: restricted approach "Avoid contact"; 24 V: not specified (from memory)', () => {
    // NFPA 70E Table 130.4(E)(a), 50 V-150 V and < 50 V rows (from memory, unverified)
    const low = shockApproachBoundaries(120);
    expect(low?.range).toBe('50 V-150 V');
    expect(low?.restrictedApproach.text).toBe('Avoid contact');
    expect(low?.restrictedApproach.m).toBeUndefined();
    expect(low?.limitedApproachFixed.ftIn).toBe('3 ft 6 in');
    expect(shockApproachBoundaries(24)?.restrictedApproach.text).toBe('Not specified');
  });

  it('34.5 kV: limited 6 ft 0 in (fixed), restricted 2 ft 7 in (agrees with an older published edition)', () => {
    // NFPA 70E Table 130.4(E)(a), 15.1 kV-36 kV row: imperial values agree with an older published edition
    const b = shockApproachBoundaries(34500);
    expect(b?.range).toBe('15.1 kV-36 kV');
    expect(b?.limitedApproachFixed.ftIn).toBe('6 ft 0 in');
    expect(b?.restrictedApproach.ftIn).toBe('2 ft 7 in');
  });

  it('between rows the higher row applies; above the table there is no row', () => {
    // NFPA 70E Table 130.4(E)(a) has gaps between rows (e.g. 121-138 kV): the higher row is the conservative choice
    expect(shockApproachBoundaries(130000)?.range).toBe('138 kV-145 kV');
    expect(shockApproachBoundaries(900000)).toBeNull();
  });

  it('records where each row comes from', () => {
    expect(shockApproachBoundaries(480)?.source).toContain('NFPA 70E');
    expect(shockApproachBoundaries(4160)?.status).toContain('from memory');
  });
});

describe('voltage-rated glove class (ASTM D120 maximum use voltage, AC; from memory, unverified)', () => {
  it.each([
    [120, '00'], // class 00: 500 V
    [480, '00'], // 480 V ≤ 500 V, the maximum use voltage of class 00 (many safety programs choose class 0 here)
    [600, '0'], // class 0: 1 kV
    [4160, '1'], // class 1: 7.5 kV
    [13800, '2'], // class 2: 17 kV
    [25000, '3'], // class 3: 26.5 kV
    [34500, '4'], // class 4: 36 kV
  ])('%d V → class %s', (voltageV, expected) => {
    // ASTM D120 (from memory, unverified)
    const g = gloveClass(voltageV);
    expect(g?.class).toBe(expected);
    expect(g?.status).toContain('from memory');
    expect(g?.maxUseVoltageAcV).toBeGreaterThanOrEqual(voltageV);
  });

  it('no class above 36 kV', () => {
    // ASTM D120: class 4 is the highest (36 kV maximum use, from memory)
    expect(gloveClass(46000)).toBeNull();
  });
});

describe('minimum arc rating (common practice, no source: round the incident energy up to a whole cal/cm²)', () => {
  it.each([
    [0.4, 1],
    [1.2, 2],
    [3.19, 4],
    [4, 4],
    [4.01, 5],
    [39.2, 40],
  ])('%f cal/cm² → %d cal/cm²', (energy, rating) => {
    expect(minimumArcRatingCalPerCm2(energy)).toBe(rating);
  });

  it('floating-point noise above a whole value does not raise the rating', () => {
    expect(minimumArcRatingCalPerCm2(8 * (1 + 1e-15))).toBe(8);
  });
});

describe('site-specific PPE level (default table: common practice, no source)', () => {
  it('default levels sit at the NFPA 70E Table 130.7(C)(15)(c) arc-rating steps 4, 8, 25, 40 cal/cm²', () => {
    // NFPA 70E Table 130.7(C)(15)(c): PPE categories 1-4 require at least 4, 8, 25, 40 cal/cm² (read in a published copy)
    expect(DEFAULT_PPE_LEVELS.map((l) => l.maxCalPerCm2)).toEqual([4, 8, 25, 40]);
  });

  it.each([
    [0.8, 'PPE level 1'],
    [4, 'PPE level 1'],
    [4.01, 'PPE level 2'],
    [8, 'PPE level 2'],
    [12, 'PPE level 3'],
    [25, 'PPE level 3'],
    [39.9, 'PPE level 4'],
    [40, 'PPE level 4'],
  ])('%f cal/cm² → %s', (energy, name) => {
    expect(sitePpeLevel(energy)?.name).toBe(name);
  });

  it('above the last level there is none', () => {
    expect(sitePpeLevel(40.01)).toBeNull();
  });

  it("uses the organization's own table, in any order", () => {
    const levels = [
      { name: 'Suit', maxCalPerCm2: 40 },
      { name: 'Everyday', maxCalPerCm2: 12 },
    ];
    expect(sitePpeLevel(10, levels)?.name).toBe('Everyday');
    expect(sitePpeLevel(13, levels)?.name).toBe('Suit');
    const label = computeLabelValues(resultWith(13), 480, { ppeLevels: levels });
    expect(label.ppeLevel?.name).toBe('Suit');
    expect(label.ppeLevelBasis).toContain('organization');
  });

  it('an empty or invalid table is invalid input', () => {
    expect(engineError(() => sitePpeLevel(5, [])).kind).toBe('invalid-input');
    const bad = engineError(() => sitePpeLevel(5, [{ name: 'X', maxCalPerCm2: Number.NaN }]));
    expect(bad.kind).toBe('invalid-input');
    expect(bad.field).toBe('ppeLevels[0].maxCalPerCm2');
  });
});

describe('signal word (organization rule; default DANGER above 40 cal/cm² — common practice, no source)', () => {
  it('default: WARNING up to 40 cal/cm², DANGER above', () => {
    expect(signalWord(40, 480)).toBe('WARNING');
    expect(signalWord(40.01, 480)).toBe('DANGER');
    expect(signalWord(2, 13800)).toBe('WARNING');
  });

  it('the rule is a parameter: energy threshold and an optional voltage threshold', () => {
    expect(signalWord(10, 480, { dangerAboveCalPerCm2: 8 })).toBe('DANGER');
    expect(signalWord(2, 4160, { dangerAboveCalPerCm2: 40, dangerAboveVoltageV: 600 })).toBe('DANGER');
    expect(signalWord(2, 480, { dangerAboveCalPerCm2: 40, dangerAboveVoltageV: 600 })).toBe('WARNING');
    // Above 40 cal/cm² no arc-rated PPE is adequate: DANGER even when the organization sets a higher threshold
    // (common practice, no source; the higher hazard wins).
    expect(signalWord(45, 480, { dangerAboveCalPerCm2: 60 })).toBe('DANGER');
    expect(signalWord(40, 480, { dangerAboveCalPerCm2: 60 })).toBe('WARNING');
    const label = computeLabelValues(resultWith(10), 480, { signalWordRule: { dangerAboveCalPerCm2: 8 } });
    expect(label.signalWord).toBe('DANGER');
    expect(label.signalColor).toBe('safety red'); // ANSI Z535.4: DANGER in safety red
    expect(label.signalWordBasis).toContain('above 8 cal/cm²');
  });
});

describe('above 40 cal/cm²: no adequate PPE (common practice, no source)', () => {
  it('flags it, adds the caution, gives no PPE level and DANGER by default', () => {
    expect(noAdequatePpe(40)).toBe(false);
    expect(noAdequatePpe(40.5)).toBe(true);
    const label = computeLabelValues(resultWith(55), 480);
    expect(label.noAdequatePpe).toBe(true);
    expect(label.ppeLevel).toBeNull();
    expect(label.signalWord).toBe('DANGER');
    expect(label.cautions).toContain(NO_ADEQUATE_PPE_CAUTION);
    expect(label.minimumArcRatingCalPerCm2).toBe(55);
  });

  it('a long-cleared 480 V fault reaches it through the engine', () => {
    // IEEE 1584-2018 model, 480 V, VCB, 50 kA, 32 mm gap, 457.2 mm, 2 s: far above 40 cal/cm²
    const r = computeIncidentEnergy({
      voltageV: 480,
      boltedFaultKa: 50,
      electrodeConfig: 'VCB',
      gapMm: 32,
      workingDistanceMm: 457.2,
      enclosureMm: { height: 508, width: 508, depth: 508 },
      arcDurationMs: 2000,
    });
    const label = computeLabelValues(r, 480);
    expect(r.incidentEnergyCalPerCm2).toBeGreaterThan(40);
    expect(label.noAdequatePpe).toBe(true);
    expect(label.signalWord).toBe('DANGER');
  });
});

describe('inputs', () => {
  it('a non-positive or non-finite nominal voltage is invalid input', () => {
    for (const v of [0, -480, Number.NaN, Number.POSITIVE_INFINITY]) {
      const e = engineError(() => computeLabelValues(resultWith(2), v));
      expect(e.kind).toBe('invalid-input');
      expect(e.field).toBe('nominalVoltageV');
    }
  });

  it('below 1.2 cal/cm² (5.0 J/cm², the arc-flash boundary threshold) the label says so', () => {
    // NFPA 70E / IEEE 1584-2018: the arc-flash boundary is where the energy is 1.2 cal/cm² (5.0 J/cm²)
    expect(computeLabelValues(resultWith(1.1), 208).belowArcFlashThreshold).toBe(true);
    expect(computeLabelValues(resultWith(1.3), 208).belowArcFlashThreshold).toBe(false);
  });
});
