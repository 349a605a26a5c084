import { modelSchema, type ModelInput } from '../../shared/schemas/model';
import { editDistance, findUnknownKeys, suggestKey } from '../../shared/unknownKeys';
import { exportModelCsv, exportModelJson, exportModelWorkbook, importModel, importModelJson } from '../../server/io';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { pumpStationModel } from '../../server/seed/pumpStationModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';

/**
 * JSON import refuses keys the model does not know, naming the path (docs/MODEL-FORMAT.md, Import and export). The
 * expected paths and suggestions are worked by hand from the schema in shared/schemas/model.ts (common practice, no
 * source: a misspelt key is refused rather than dropped).
 */

const model = (): Record<string, unknown> & ModelInput => JSON.parse(JSON.stringify(larkspurModel()));
const importText = (m: unknown) => importModelJson(JSON.stringify(m), 'plant.json');

function errorsOf(m: unknown) {
  const r = importText(m);
  if (r.ok) throw new Error('expected the import to be refused');
  return r.errors;
}

describe('edit distance and the suggestion', () => {
  it('counts edits (hand-worked: kitten → sitting 3, ab → ba 1 transposition)', () => {
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('ab', 'ba')).toBe(1);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('same', 'same')).toBe(0);
  });

  it('prefers the same letters in another case, then the nearest key', () => {
    expect(suggestKey('workingDistanceMM', ['gapMm', 'workingDistanceMm'])).toBe('workingDistanceMm');
    expect(suggestKey('lenghtM', ['lengthM', 'sets', 'size'])).toBe('lengthM');
    expect(suggestKey('colour', ['id', 'name', 'nominalKv', 'equipment'])).toBeUndefined();
  });
});

describe('unknown keys in a JSON model', () => {
  it('a valid model passes unchanged: the three demo models, and the demo exported as JSON', () => {
    for (const m of [larkspurModel(), pumpStationModel(), solidsBuildingModel()]) {
      expect(findUnknownKeys(modelSchema, m)).toEqual([]);
      const r = importText(m);
      expect(r.ok).toBe(true);
      if (r.ok) expect(r.input).toEqual(JSON.parse(JSON.stringify(m)));
    }
    const exported = exportModelJson(modelSchema.parse(larkspurModel()));
    const r = importModelJson(exported, 'larkspur.json');
    expect(r.ok).toBe(true);
  });

  it('at the top level, with a suggestion', () => {
    const m = { ...model(), frequencyHZ: 60 };
    const errors = errorsOf(m);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({
      file: 'plant.json',
      path: 'frequencyHZ',
      message: 'unknown field — did you mean frequencyHz?',
    });
    expect(errors[0].where).toBe('plant.json frequencyHZ');
  });

  it("in a bus's equipment: buses[3].equipment.workingDistanceMM, naming the bus", () => {
    const m = model();
    const bus = m.buses[3] as Record<string, unknown> & { id: string; equipment?: Record<string, unknown> };
    bus.equipment = { ...(bus.equipment ?? { class: 'lv-switchgear' }), workingDistanceMM: 914 };
    const errors = errorsOf(m);
    expect(errors).toHaveLength(1);
    expect(`${errors[0].path}: ${errors[0].message}`).toBe(
      'buses[3].equipment.workingDistanceMM: unknown field — did you mean workingDistanceMm?',
    );
    expect(errors[0].elementId).toBe(bus.id);
  });

  it("in a device's settings (the kind its discriminator selects), without a suggestion", () => {
    const m = model();
    const i = m.devices!.findIndex((d) => d.device.kind === 'relay');
    expect(i).toBeGreaterThanOrEqual(0);
    (m.devices![i].device as Record<string, unknown>).colour = 'red';
    (m.devices![i].device as Record<string, unknown>).timeDail = 2;
    const errors = errorsOf(m);
    expect(errors.map((e) => e.path)).toEqual([`devices[${i}].device.colour`, `devices[${i}].device.timeDail`]);
    expect(errors[0].message).toMatch(/^unknown field — the fields here are kind, name, curve, /);
    expect(errors[1].message).toBe('unknown field — did you mean timeDial?');
  });

  it('in an array element (a cable)', () => {
    const m = model();
    (m.cables![1] as Record<string, unknown>).lenghtM = 30;
    const errors = errorsOf(m);
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({ path: 'cables[1].lenghtM', message: 'unknown field — did you mean lengthM?' });
  });

  it('in the switch positions of a library reference (a record keyed by setting name)', () => {
    const m = model();
    const i = m.devices!.findIndex((d) => d.library?.positions !== undefined);
    if (i < 0) {
      m.devices![0].library = { deviceTypeId: 'x', name: 'x', positions: { longTimePikup: '1.0' } as never };
    } else {
      (m.devices![i].library!.positions as Record<string, string>).longTimePikup = '1.0';
    }
    const at = i < 0 ? 0 : i;
    const errors = errorsOf(m);
    expect(errors.map((e) => `${e.path}: ${e.message}`)).toEqual([
      `devices[${at}].library.positions.longTimePikup: unknown field — did you mean longTimePickup?`,
    ]);
  });

  it('in a scenario override (strict in the schema too): the same message as everywhere else', () => {
    const m = model();
    const sourceId = m.sources![0].id;
    m.scenarios = [{ id: 'util-min', sources: { [sourceId]: { shortCircuitMVA: 100 } as never } }];
    const errors = errorsOf(m);
    expect(errors.map((e) => `${e.path}: ${e.message}`)).toEqual([
      `scenarios[0].sources.${sourceId}.shortCircuitMVA: unknown field — did you mean shortCircuitMva?`,
    ]);
  });

  it('every unknown key is listed, in document order, and nothing is imported (importModel refuses)', async () => {
    const m = { ...model(), extra: 1 };
    (m.buses[0] as Record<string, unknown>).nominalKV = 13.8;
    const r = await importModel([
      { name: 'plant.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(m)) },
    ]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.path)).toEqual(['buses[0].nominalKV', 'extra']);
  });
});

describe('unknown keys in the JSON of a table cell (workbook, CSV)', () => {
  /** The demo with one relay's device JSON holding a misspelt key, and that device's index. */
  function withMisspeltDevice() {
    const m = modelSchema.parse(larkspurModel());
    const i = m.devices.findIndex((d) => d.device.kind === 'relay');
    (m.devices[i].device as Record<string, unknown>).timeDail = 3;
    return { m, i, id: m.devices[i].id };
  }

  it('a workbook: refused at the Devices sheet, the device row and column, naming the key', async () => {
    const { m, i, id } = withMisspeltDevice();
    const r = await importModel([
      {
        name: 'plant.xlsx',
        mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
        buffer: Buffer.from(await exportModelWorkbook(m)),
      },
    ]);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatchObject({
      sheet: 'Devices',
      row: i + 2, // the header is row 1
      path: `devices[${i}].device.timeDail`,
      elementId: id,
      message: 'device.timeDail: unknown field — did you mean timeDial?',
    });
    expect(r.errors[0].column).toMatch(/^device \(/);
  });

  it('CSV files: refused at devices.csv, the line and the column', async () => {
    const { m, i } = withMisspeltDevice();
    const files = Object.entries(exportModelCsv(m)).map(([table, text]) => ({
      name: `${table}.csv`,
      mimeType: 'text/csv',
      buffer: Buffer.from(text),
    }));
    const r = await importModel(files);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.map((e) => [e.file, e.row, e.message])).toEqual([
      ['devices.csv', i + 2, 'device.timeDail: unknown field — did you mean timeDial?'],
    ]);
  });
});
