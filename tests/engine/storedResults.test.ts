/**
 * The stored text of a run's results (server/engine/study/storedResults.ts): values repeated on many buses (label
 * bases, shock-approach and glove tables, cautions, equipment) stored once, and put back when read. Read back, the
 * results must be the results computed, byte for byte under JSON.stringify (ECMA-404 / JSON.stringify is the
 * reference), on the demo plant (generator, motors), with operating scenarios, on a generated plant and with a bus
 * that fails; results stored before this form read as they are; each bus gets its own copies; a damaged text fails
 * loudly rather than put a number where a label's words belong.
 */
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { studyResultsSchema, type StudyResults } from '../../shared/schemas/studyResults';
import { parseStoredResults, runStudy, storedResultsText } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { radialPlant } from '../../server/bench/scaling';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

function roundTrip(results: StudyResults): string {
  const stored = storedResultsText(results);
  expect(JSON.stringify(parseStoredResults(stored))).toBe(JSON.stringify(results));
  return stored;
}

describe('stored results', () => {
  it('read back byte for byte on the demo plant (both motor settings) and with operating scenarios', () => {
    roundTrip(runStudy(parsed(larkspurModel()), {}));
    roundTrip(runStudy(parsed(larkspurModel()), { motorDecayModel: 'exponential', maxArcDurationMs: 1000 }));
    const withScenarios = runStudy(parsed(solidsBuildingModel()), {});
    expect(withScenarios.scenarios?.length).toBeGreaterThan(1);
    roundTrip(withScenarios);
  });

  it('on a generated radial plant the repeated label values are stored once: the text is much shorter', () => {
    const results = runStudy(parsed(radialPlant(300)), {});
    const stored = roundTrip(results);
    const plain = JSON.stringify(results);
    // Each bus's label-value bases, tables and cautions (about 2 kB of the bus's text) are stored once.
    expect(stored.length).toBeLessThan(0.75 * plain.length);
    // A caution appears once per distinct list of cautions in the stored text, not once per bus.
    const caution = results.buses.find((b) => b.labelValues)!.labelValues!.cautions[0];
    const lists = new Set(
      results.buses.flatMap((b) =>
        b.labelValues?.cautions.includes(caution) ? [JSON.stringify(b.labelValues.cautions)] : [],
      ),
    );
    expect(lists.size).toBeLessThan(5);
    expect(stored.split(JSON.stringify(caution)).length - 1).toBe(lists.size);
    expect(plain.split(JSON.stringify(caution)).length - 1).toBeGreaterThan(100);
  });

  it('a bus that fails (no label values, no equipment) is stored as it is', () => {
    const model = parsed(radialPlant(200));
    const bad = model.buses.find((b) => b.id === 'MCC-0-5')!;
    (bad.equipment as { class: string }).class = 'no-such-class';
    const results = runStudy(model, {});
    expect(results.buses.find((b) => b.busId === 'MCC-0-5')?.status).toBe('error');
    roundTrip(results);
  });

  it('values that differ only in key order, in an undefined key or in a number stay apart; many distinct values too', () => {
    const results = runStudy(parsed(radialPlant(300)), {});
    const labelled = results.buses.filter((b) => b.labelValues && b.equipment);
    // Key order: the same fields, reversed.
    const eq = labelled[0].equipment!;
    labelled[0].equipment = Object.fromEntries(Object.entries(eq).reverse()) as typeof eq;
    // A key whose value is undefined (JSON leaves it out).
    labelled[1].labelValues!.shockApproach = {
      ...labelled[1].labelValues!.shockApproach!,
      extra: undefined,
    } as NonNullable<StudyResults['buses'][number]['labelValues']>['shockApproach'];
    // One number apart.
    labelled[2].labelValues!.gloveClass = { ...labelled[2].labelValues!.gloveClass!, maxUseVoltageAcV: 999 };
    // More distinct values under one key than are compared one by one (then looked up by their text).
    labelled.slice(3, 40).forEach((b, i) => {
      b.labelValues!.gloveClass = { ...b.labelValues!.gloveClass!, status: `status ${i % 25}` };
    });
    const stored = roundTrip(results);
    expect(JSON.parse(stored).shared.length).toBeGreaterThan(25);
  });

  it('results stored before this form (plain JSON of the results) read as they are', () => {
    const results = runStudy(parsed(larkspurModel()), {});
    const plain = JSON.stringify(results);
    expect(JSON.stringify(parseStoredResults(plain))).toBe(plain);
  });

  it('each bus reads its own copy: changing one bus changes no other', () => {
    const results = runStudy(parsed(radialPlant(200)), {});
    const back = parseStoredResults(storedResultsText(results));
    const [a, b] = back.buses.filter((x) => x.labelValues && x.equipment);
    a.labelValues!.cautions.push('changed');
    a.labelValues!.shockApproach!.range = 'changed';
    a.equipment!.typicalValuesUsed.push('changed');
    expect(b.labelValues!.cautions).not.toContain('changed');
    expect(b.labelValues!.shockApproach!.range).not.toBe('changed');
    expect(b.equipment!.typicalValuesUsed).not.toContain('changed');
    // And what is read back is valid results.
    expect(studyResultsSchema.safeParse(parseStoredResults(storedResultsText(results))).success).toBe(true);
  });

  it('a reader that skipped parseStoredResults finds no buses; a damaged index or an unknown form fails', () => {
    const results = runStudy(parsed(radialPlant(200)), {});
    const stored = storedResultsText(results);
    expect((JSON.parse(stored) as { buses?: unknown }).buses).toBeUndefined();
    const raw = JSON.parse(stored) as { shared: unknown[]; results: StudyResults };
    raw.shared = raw.shared.slice(0, 1);
    expect(() => parseStoredResults(JSON.stringify(raw))).toThrow(/damaged/);
    expect(() => parseStoredResults(stored.replace('"storedFormat":2', '"storedFormat":99'))).toThrow(/unknown form/);
  });
});
