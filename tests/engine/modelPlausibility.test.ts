/**
 * Plausibility warnings: values the schema accepts but that are rarely right. The limits are common practice, no
 * source; the nominal voltages are ANSI C84.1 / IEC 60038 standard values (from memory). Each rule is checked with
 * a value just inside (no warning) and one outside (a warning naming the element and field); the demo plants, which
 * are ordinary, give none; a run carries them in its warnings without changing any number.
 */
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { runStudy } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { pumpStationModel } from '../../server/seed/pumpStationModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};
const edited = (edit: (m: ModelInput) => void): Model => {
  const m = larkspurModel();
  edit(m);
  return parsed(m);
};
const paths = (m: Model) => plausibilityWarnings(m).map((w) => w.path);

describe('plausibility warnings', () => {
  it('none on the demo plants', () => {
    for (const m of [larkspurModel(), pumpStationModel(), solidsBuildingModel()]) expect(paths(parsed(m))).toEqual([]);
  });

  it('a utility above 200 kA available (MVA converted at the bus voltage: 4000 MVA at 12.47 kV ≈ 185 kA)', () => {
    expect(paths(edited((m) => ((m.sources![0] as { shortCircuitMva: number }).shortCircuitMva = 4000)))).toEqual([]);
    const w = plausibilityWarnings(
      edited((m) => ((m.sources![0] as { shortCircuitMva: number }).shortCircuitMva = 5000)),
    );
    expect(w.map((x) => [x.path, x.elementId])).toEqual([['sources[0].shortCircuitMva', 'UTIL']]);
    // 5000 / (√3 × 12.47) = 231.49 kA.
    expect(w[0].message).toMatch(/ 231 kA is above 200 kA/);
  });

  it('transformer impedance outside 2–15 %', () => {
    expect(paths(edited((m) => (m.transformers![0].impedancePct = 2)))).toEqual([]);
    expect(paths(edited((m) => (m.transformers![0].impedancePct = 0.575)))).toEqual(['transformers[0].impedancePct']);
    expect(paths(edited((m) => (m.transformers![0].impedancePct = 57.5)))).toEqual(['transformers[0].impedancePct']);
  });

  it('a bus voltage that is no usual nominal voltage (480 V given as 480 kV, or 13.5 kV)', () => {
    const busKv = (kv: number) =>
      edited((m) => {
        const swgr = m.buses.find((b) => b.id === 'SWGR-A')!;
        swgr.nominalKv = kv;
        (m.transformers![0] as { primaryKv: number }).primaryKv = kv;
        (m.transformers![1] as { primaryKv: number }).primaryKv = kv;
      });
    expect(paths(busKv(13.8))).toEqual([]);
    expect(paths(busKv(13.5))).toEqual(['buses[0].nominalKv']);
  });

  it('a low-voltage cable over 1 km (a length in feet or millimetres?), not a medium-voltage one', () => {
    expect(paths(edited((m) => (m.cables![0].lengthM = 1000)))).toEqual([]);
    expect(paths(edited((m) => (m.cables![0].lengthM = 25000)))).toEqual(['cables[0].lengthM']);
  });

  it('a motor larger than the transformers and generators feeding its bus', () => {
    // MCC-2 is fed by the 750 kVA TX-2 (USS-2 and MCC-2 joined by a cable).
    expect(paths(edited((m) => (m.motors![2] = { ...m.motors![2], hp: 700 })))).toEqual([]);
    expect(paths(edited((m) => (m.motors![2] = { ...m.motors![2], hp: 800 })))).toEqual(['motors[2].hp']);
  });

  it('X/R above 100, a generator X"d outside 5–35 %, a locked-rotor multiple outside 3–12', () => {
    expect(paths(edited((m) => (m.transformers![0].xr = 150)))).toEqual(['transformers[0].xr']);
    expect(paths(edited((m) => ((m.sources![1] as { subtransientPct: number }).subtransientPct = 1.6)))).toEqual([
      'sources[1].subtransientPct',
    ]);
    expect(paths(edited((m) => (m.motors![0] = { ...m.motors![0], lockedRotorMultiple: 60 })))).toEqual([
      'motors[0].lockedRotorMultiple',
    ]);
  });

  it('a scenario’s utility fault level is checked too', () => {
    const m = edited((x) => {
      (x as { scenarios: unknown[] }).scenarios = [{ id: 'max', sources: { UTIL: { shortCircuitKa: 250 } } }];
    });
    expect(paths(m)).toEqual(['scenarios[0].sources.UTIL.shortCircuitKa']);
  });

  it('go into the run’s warnings and change no number', () => {
    const plain = runStudy(parsed(larkspurModel()));
    const odd = runStudy(edited((m) => (m.cables![0].lengthM = 25000)));
    expect(odd.warnings.filter((w) => w.code === 'IMPLAUSIBLE_VALUE').map((w) => w.message)).toEqual([
      expect.stringMatching(/^cables\[0\]\.lengthM: A 480 V cable of 25000 m is unusually long/),
    ]);
    expect(plain.warnings.some((w) => w.code === 'IMPLAUSIBLE_VALUE')).toBe(false);
  });
});
