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
import { gunzipSync } from 'node:zlib';
import {
  COMPRESSED_PREFIX,
  parseStoredResults,
  runBusRange,
  runStudy,
  storedJsonText,
  storedResultsFromPieces,
  storedResultsText,
} from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { radialPlant } from '../../server/bench/scaling';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

/** Stored and read back, byte for byte; the stored JSON text (decompressed where the run is large). */
function roundTrip(results: StudyResults): string {
  const stored = storedResultsText(results);
  expect(JSON.stringify(parseStoredResults(stored))).toBe(JSON.stringify(results));
  return storedJsonText(stored);
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
    expect(stored.startsWith('{')).toBe(true);
    expect((JSON.parse(stored) as { buses?: unknown }).buses).toBeUndefined();
    const raw = JSON.parse(stored) as { shared: unknown[]; results: StudyResults };
    raw.shared = raw.shared.slice(0, 1);
    expect(() => parseStoredResults(JSON.stringify(raw))).toThrow(/damaged/);
    expect(() => parseStoredResults(stored.replace('"storedFormat":2', '"storedFormat":99'))).toThrow(/unknown form/);
  });

  it('a large run is stored compressed (gzip members of the same text) and reads back byte for byte', () => {
    const results = runStudy(parsed(radialPlant(300)), {});
    const stored = storedResultsText(results);
    expect(stored.startsWith(COMPRESSED_PREFIX)).toBe(true);
    // The reference decompressor: node's zlib reading RFC 1952 gzip (several members decompress to their text joined).
    const text = gunzipSync(Buffer.from(stored.slice(COMPRESSED_PREFIX.length), 'base64')).toString('utf8');
    expect(text).toBe(storedJsonText(stored));
    expect(JSON.parse(text).storedFormat).toBe(2);
    expect(JSON.stringify(parseStoredResults(stored))).toBe(JSON.stringify(results));
    // JSON text of results compresses well: a fifth of the text at most (about a tenth here).
    expect(stored.length).toBeLessThan(text.length / 5);
    // Damaged base64 or gzip fails loudly.
    expect(() => parseStoredResults(`${COMPRESSED_PREFIX}AAAA${stored.slice(COMPRESSED_PREFIX.length + 4)}`)).toThrow();
  });

  it('a run in parts (each range of buses on its own) reads back as the whole run, plain or compressed', () => {
    const options = { maxArcDurationMs: 2000 };
    for (const [model, counts] of [
      [parsed(larkspurModel()), [2, 3]],
      [parsed(solidsBuildingModel()), [2]],
      [parsed(radialPlant(300)), [2, 3]],
    ] as const) {
      const whole = JSON.stringify(runStudy(model, options));
      for (const count of counts) {
        const parts = Array.from({ length: count }, (_, index) =>
          runBusRange(model, options, () => {}, { index, count }),
        );
        const stored = storedResultsFromPieces(
          parts[0].head,
          parts.map((p) => p.piece),
        );
        expect(JSON.stringify(parseStoredResults(stored))).toBe(whole);
        const json = JSON.parse(storedJsonText(stored)) as { storedFormat: number; parts: { from: number }[] };
        expect(json.storedFormat).toBe(3);
        // Each part starts where the one before ended.
        let from = 0;
        json.parts.forEach((p, i) => {
          expect(p.from).toBe(from);
          from += parts[i].buses;
        });
      }
    }
  });

  it('more parts than buses (empty parts) and parts out of order or not from the first bus', () => {
    const model = parsed(larkspurModel());
    const whole = runStudy(model, {});
    const count = whole.buses.length + 3;
    const parts = Array.from({ length: count }, (_, index) => runBusRange(model, {}, () => {}, { index, count }));
    expect(parts.filter((p) => p.buses === 0).length).toBe(3);
    const stored = storedResultsFromPieces(
      parts[0].head,
      parts.map((p) => p.piece),
    );
    expect(JSON.stringify(parseStoredResults(stored))).toBe(JSON.stringify(whole));
    const raw = JSON.parse(stored) as { parts: { from: number }[] };
    const damaged = (change: (r: typeof raw) => void) => {
      const copy = JSON.parse(stored) as typeof raw;
      change(copy);
      return () => parseStoredResults(JSON.stringify(copy));
    };
    expect(damaged((r) => (r.parts[0].from = 1))).toThrow(/damaged/);
    expect(damaged((r) => r.parts.reverse())).toThrow(/damaged/);
    expect(damaged((r) => (r.parts = []))).toThrow(/damaged/);
  });
});
