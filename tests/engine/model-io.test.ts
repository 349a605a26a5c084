import ExcelJS from 'exceljs';
import * as fc from 'fast-check';
import Papa from 'papaparse';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { EngineError } from '../../server/engine/errors';
import {
  MODEL_TABLES,
  exportModel,
  exportModelCsv,
  exportModelJson,
  exportModelWorkbook,
  importModel,
  importModelCsv,
  importModelJson,
  type ImportError,
  type ImportModelResult,
  type ModelTable,
} from '../../server/io';
import { findJsonSyntaxError } from '../../server/io/modelJson';
import { tableOfFileName } from '../../server/io/modelCsv';
import { isClose } from '../helpers/approx';

/*
 * Import and export of the system model (docs/MODEL-FORMAT.md, Import and export) as JSON, .xlsx workbook and CSV.
 * These are the product's own file-format conventions (common practice, no source): no published value is involved.
 * Numbers are compared through the relative-tolerance helper only; a round trip is expected to keep them to 1e-12.
 */

const REL_TOL = 1e-12; // common practice, no source: a text round trip of a double keeps it to the last digit

/** A realistic model: a 12.47 kV utility and a generator, two transformers, cables by table size and by R/X,
 * motors by hp and kVA, a tie, and devices of every kind (an electronic one with a library reference). */
function plant(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Plant 2 – north',
    frequencyHz: 60,
    prefaultPu: 1.05,
    buses: [
      {
        id: 'SWGR-A',
        name: 'Main switchgear, "A" side',
        nominalKv: 12.47,
        equipment: {
          class: 'switchgear-15kv',
          electrodeConfig: 'VCB',
          gapMm: 152,
          workingDistanceMm: 914.4,
          enclosureMm: { height: 1143, width: 762, depth: 762 },
          mainIsolated: true,
        },
      },
      { id: 'SWGR-B', name: 'Generator switchgear', nominalKv: 12.47, equipment: { class: 'switchgear-15kv' } },
      { id: 'SWBD-1', nominalKv: 0.48, equipment: { class: 'switchgear-lv', workingDistanceMm: 609.6 } },
      { id: 'MCC-2', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep', mainIsolated: false } },
      {
        id: 'PNL-7',
        name: '=lighting panel',
        nominalKv: 0.48,
        equipment: { class: 'mcc-panelboard-lv-shallow', electrodeConfig: 'VCBB' },
      },
      { id: 'PNL-8', nominalKv: 0.48 },
      { id: 'MCC-5', name: 'Pump № 1 MCC', nominalKv: 4.16, equipment: { class: 'mcc-5kv', gapMm: 104 } },
    ],
    sources: [
      { id: 'UTIL-1', name: 'Utility service', kind: 'utility', bus: 'SWGR-A', shortCircuitMva: 250, xr: 10 },
      { id: 'GEN-1', kind: 'generator', bus: 'SWGR-B', kva: 2500, kv: 12.47, subtransientPct: 15.5, xr: 25 },
    ],
    transformers: [
      {
        id: 'TX-1',
        fromBus: 'SWGR-A',
        toBus: 'SWBD-1',
        kva: 1500,
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      },
      {
        id: 'TX-2',
        name: 'Pump transformer',
        fromBus: 'SWGR-B',
        toBus: 'MCC-5',
        kva: 2000,
        primaryKv: 12.47,
        secondaryKv: 4.16,
        impedancePct: 6.5,
      },
    ],
    cables: [
      {
        id: 'FDR-3',
        fromBus: 'SWBD-1',
        toBus: 'MCC-2',
        lengthM: 45,
        sets: 2,
        size: '500kcmil',
        material: 'Cu',
        conduit: 'steel',
      },
      {
        id: 'FDR-4',
        name: '-480 V lighting feeder',
        fromBus: 'SWBD-1',
        toBus: 'PNL-7',
        lengthM: 61.3,
        rOhmPerKm: 0.1734,
        xOhmPerKm: 0.0853,
      },
      { id: 'FDR-5', fromBus: 'MCC-2', toBus: 'PNL-8', lengthM: 12.2, size: '4/0', material: 'Al', conduit: 'pvc' },
    ],
    motors: [
      { id: 'P-101', bus: 'MCC-2', hp: 150, kv: 0.46 },
      { id: 'M-201', name: 'Pump № 1', bus: 'MCC-5', kva: 1000, kv: 4, lockedRotorMultiple: 6, xr: 20 },
      { id: 'M-202', bus: 'MCC-5', hp: 800, kv: 4, subtransientPct: 16.7, firstCycleMultiplier: 1.2 },
    ],
    ties: [{ id: 'TIE-AB', name: 'Bus tie', fromBus: 'SWGR-A', toBus: 'SWGR-B', closed: false }],
    devices: [
      {
        id: 'R-TX1-P',
        name: 'Transformer primary relay',
        branch: 'TX-1',
        end: 'from',
        device: {
          kind: 'relay',
          curve: 'IEEE-VI',
          ctRatio: 120,
          pickupSecondaryA: 0.75,
          timeDial: 2.5,
          instantaneousA: 1200,
          definiteTime: { pickupA: 600, delayS: 0.3 },
          breakerCycles: 5,
        },
      },
      {
        id: 'F-TX2-P',
        branch: 'TX-2',
        end: 'from',
        device: {
          kind: 'fuse',
          ratingA: 125,
          totalClearing: [
            [250, 300],
            [500, 10],
            [2000, 0.05],
          ],
          minimumMelt: [
            [200, 300],
            [400, 10],
            [1600, 0.02],
          ],
        },
      },
      {
        id: 'B-GEN-1',
        source: 'GEN-1',
        device: {
          kind: 'band',
          ratingA: 150,
          currentUnit: 'multiple',
          min: [
            [1.2, 100],
            [10, 0.5],
          ],
          max: [
            [1.5, 200],
            [12, 0.8],
          ],
        },
      },
      {
        id: 'CB-FDR4',
        branch: 'FDR-4',
        end: 'from',
        device: {
          kind: 'thermal-magnetic',
          ratingA: 225,
          thermal: {
            min: [
              [1.35, 1000],
              [6, 5],
            ],
            max: [
              [1.35, 4000],
              [6, 20],
            ],
          },
          instantaneous: { lowMultiple: 5, highMultiple: 10, setting: 'C' },
        },
      },
      {
        id: 'CB-TX1-S',
        name: 'Secondary main',
        branch: 'TX-1',
        end: 'to',
        device: {
          kind: 'electronic',
          sensorA: 2000,
          longTime: { pickup: 0.9, delayS: 4 },
          shortTime: { pickup: 4, delayS: 0.2, i2t: true },
          instantaneous: { pickup: 12 },
          groundFault: { pickupA: 400, delayS: 0.1 },
          pickupTolerancePct: 10,
          clearingS: 0.05,
        },
        library: {
          deviceTypeId: 'elec-2000',
          name: 'Electronic trip 2000 A',
          positions: { longTimePickup: '0.9', longTimeDelay: '4', shortTimeI2t: 'IN' },
        },
      },
      {
        id: 'F-P101',
        source: 'P-101',
        device: {
          kind: 'fuse',
          ratingA: 250,
          averageMelt: [
            [500, 100],
            [2500, 0.02],
          ],
        },
      },
      {
        id: 'R-TIE',
        branch: 'TIE-AB',
        end: 'to',
        device: { kind: 'relay', curve: 'IEC-SI', pickupA: 400, timeDial: 0.1, breakerCycles: 3, frequencyHz: 60 },
      },
    ],
  };
}

function parsed(input: ModelInput): Model {
  const result = parseModel(input);
  if (!result.success) throw new Error(`fixture does not parse: ${JSON.stringify(result.issues)}`);
  return result.model;
}

/** Deep comparison: same keys, same strings and booleans, numbers within REL_TOL (never exact float equality). */
function expectSame(actual: unknown, expected: unknown, path = 'model'): void {
  if (typeof expected === 'number') {
    if (typeof actual !== 'number' || !isClose(actual, expected, REL_TOL)) {
      throw new Error(`${path}: expected ${expected}, got ${JSON.stringify(actual)}`);
    }
    return;
  }
  if (Array.isArray(expected)) {
    if (!Array.isArray(actual) || actual.length !== expected.length) {
      throw new Error(`${path}: expected an array of ${expected.length}, got ${JSON.stringify(actual)}`);
    }
    expected.forEach((e, i) => expectSame(actual[i], e, `${path}[${i}]`));
    return;
  }
  if (expected !== null && typeof expected === 'object') {
    if (actual === null || typeof actual !== 'object' || Array.isArray(actual)) {
      throw new Error(`${path}: expected an object, got ${JSON.stringify(actual)}`);
    }
    const keys = (o: object) =>
      Object.keys(o)
        .filter((k) => (o as Record<string, unknown>)[k] !== undefined)
        .sort();
    expect(`${path}: ${keys(actual).join(',')}`).toBe(`${path}: ${keys(expected).join(',')}`);
    for (const k of keys(expected)) {
      expectSame((actual as Record<string, unknown>)[k], (expected as Record<string, unknown>)[k], `${path}.${k}`);
    }
    return;
  }
  expect({ path, value: actual }).toEqual({ path, value: expected });
}

function modelOf(result: ImportModelResult): Model {
  if (!result.ok) throw new Error(`import failed: ${result.errors.map((e) => `${e.where}: ${e.message}`).join('; ')}`);
  return result.model;
}

function errorsOf(result: ImportModelResult): ImportError[] {
  expect(result.ok).toBe(false);
  expect(result).not.toHaveProperty('model'); // nothing partial
  return result.ok ? [] : result.errors;
}

const asBuffer = (body: Buffer | string) => (typeof body === 'string' ? Buffer.from(body, 'utf8') : body);

async function csvUpload(model: Model) {
  return Promise.all(
    MODEL_TABLES.map(async (table) => {
      const file = await exportModel(model, 'csv', table);
      return { name: file.filename, mimeType: file.mimeType, buffer: asBuffer(file.body) };
    }),
  );
}

async function loadWorkbook(buffer: Buffer): Promise<ExcelJS.Workbook> {
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load(buffer as unknown as ExcelJS.Buffer);
  return workbook;
}

async function editedWorkbook(model: Model, edit: (workbook: ExcelJS.Workbook) => void) {
  const workbook = await loadWorkbook(await exportModelWorkbook(model));
  edit(workbook);
  const buffer = Buffer.from((await workbook.xlsx.writeBuffer()) as unknown as ArrayBuffer);
  return importModel([{ name: 'plant.xlsx', buffer }]);
}

/** The header cell (1-based column) of a sheet's column. */
function columnNumber(sheet: ExcelJS.Worksheet, header: string): number {
  const row = sheet.getRow(1);
  for (let c = 1; c <= sheet.columnCount; c += 1) if (row.getCell(c).value === header) return c;
  throw new Error(`no column ${header} in ${sheet.name}`);
}

const original = parsed(plant());

describe('round trips (common practice, no source: export then import gives the same model)', () => {
  it('the fixture is a valid model with every device kind', () => {
    expect(new Set(original.devices.map((d) => d.device.kind))).toEqual(
      new Set(['relay', 'fuse', 'band', 'thermal-magnetic', 'electronic']),
    );
    expect(original.devices.some((d) => d.library !== undefined)).toBe(true);
  });

  it('JSON', async () => {
    const file = await exportModel(original, 'json');
    expect(file.filename).toBe('plant-2-north.json');
    expect(file.mimeType).toBe('application/json');
    expect(String(file.body)).toContain('\n  "format": "emberline-model",\n  "version": 1,');
    expectSame(modelOf(await importModel([{ name: file.filename, buffer: asBuffer(file.body) }])), original);
  });

  it('workbook', async () => {
    const file = await exportModel(original, 'xlsx');
    expect(file.filename).toBe('plant-2-north.xlsx');
    expect(file.mimeType).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expectSame(modelOf(await importModel([{ name: file.filename, buffer: asBuffer(file.body) }])), original);
  });

  it('CSV, one file per table', async () => {
    const upload = await csvUpload(original);
    expect(upload.map((f) => f.name)).toEqual([
      'about.csv',
      'buses.csv',
      'sources.csv',
      'transformers.csv',
      'cables.csv',
      'motors.csv',
      'ties.csv',
      'devices.csv',
      'scenarios.csv',
    ]);
    expectSame(modelOf(await importModel(upload)), original);
  });

  it('generator decrement data round trip through every format (common practice, no source)', async () => {
    const withDecrement: Model = {
      ...original,
      sources: original.sources.map((s) =>
        s.kind === 'generator'
          ? {
              ...s,
              transientPct: 22.5,
              sustainedCurrentMultiple: 3,
              subtransientTimeConstantS: 0.02,
              transientTimeConstantS: 0.35,
            }
          : s,
      ),
    };
    for (const format of ['json', 'xlsx'] as const) {
      const file = await exportModel(withDecrement, format);
      expectSame(modelOf(await importModel([{ name: file.filename, buffer: asBuffer(file.body) }])), withDecrement);
    }
    expectSame(modelOf(await importModel(await csvUpload(withDecrement))), withDecrement);
  });

  it('a minimal model (no optional tables, no About) round trips through every format', async () => {
    const minimal = parsed({
      format: 'emberline-model',
      version: 1,
      buses: [{ id: 'B', nominalKv: 0.48 }],
      sources: [{ id: 'U', kind: 'utility', bus: 'B', shortCircuitKa: 42, xr: 4 }],
    });
    for (const format of ['json', 'xlsx'] as const) {
      const file = await exportModel(minimal, format);
      expectSame(modelOf(await importModel([{ name: file.filename, buffer: asBuffer(file.body) }])), minimal);
    }
    // Only the two tables that hold elements: format and version are the current ones.
    const csv = exportModelCsv(minimal);
    expectSame(
      modelOf(
        await importModel(
          ['buses', 'sources'].map((t) => ({ name: `${t}.csv`, buffer: Buffer.from(csv[t as ModelTable]) })),
        ),
      ),
      minimal,
    );
  });

  it('property: random ids, names and positive values survive all three formats', async () => {
    const id = fc.stringMatching(/^[A-Z][A-Z0-9-]{0,11}$/);
    const value = fc.double({ min: 1e-6, max: 1e6, noNaN: true, noDefaultInfinity: true });
    await fc.assert(
      fc.asyncProperty(
        id,
        id,
        fc.string({ unit: 'grapheme', maxLength: 40 }),
        value,
        value,
        async (busKey, sourceKey, name, lengthM, xr) => {
          // Prefixes keep the ids of different element kinds apart (ids are unique across the model).
          const busId = `B-${busKey}`;
          const sourceId = `S-${sourceKey}`;
          const model = parsed({
            format: 'emberline-model',
            version: 1,
            name: name.trim() === '' ? undefined : name,
            buses: [
              { id: busId, nominalKv: 0.48 },
              { id: `${busId}-2`, nominalKv: 0.48 },
            ],
            sources: [{ id: sourceId, kind: 'utility', bus: busId, shortCircuitMva: 30, xr }],
            cables: [{ id: 'C-1', fromBus: busId, toBus: `${busId}-2`, lengthM, rOhmPerKm: xr, xOhmPerKm: lengthM }],
          });
          for (const format of ['json', 'xlsx'] as const) {
            const file = await exportModel(model, format);
            expectSame(modelOf(await importModel([{ name: file.filename, buffer: asBuffer(file.body) }])), model);
          }
          expectSame(modelOf(await importModel(await csvUpload(model))), model);
        },
      ),
      { numRuns: 25 },
    );
  });
});

describe('arc-duration cap per bus in the flat files', () => {
  it('a bus cap and "no cap" (null) survive the workbook and the CSV files, with their reasons', async () => {
    const m = plant();
    m.buses[1].equipment = { ...m.buses[1].equipment!, arcDurationCapS: 5, arcDurationCapReason: 'Confined vault' };
    m.buses[2].equipment = { ...m.buses[2].equipment!, arcDurationCapS: null, arcDurationCapReason: 'Bucket truck' };
    const model = parsed(m);
    const fromWorkbook = modelOf(await editedWorkbook(model, () => undefined));
    const fromCsv = modelOf(await importModel(await csvUpload(model)));
    for (const back of [fromWorkbook, fromCsv]) {
      expect(back.buses[1].equipment).toEqual(
        expect.objectContaining({ arcDurationCapS: 5, arcDurationCapReason: 'Confined vault' }),
      );
      expect(back.buses[2].equipment).toEqual(
        expect.objectContaining({ arcDurationCapS: null, arcDurationCapReason: 'Bucket truck' }),
      );
      expect(back.buses[0].equipment?.arcDurationCapS).toBeUndefined();
    }
  });
});

describe('workbook layout', () => {
  it('has an About sheet first, then one sheet per element type, then Scenarios, header bold and frozen', async () => {
    const workbook = await loadWorkbook(await exportModelWorkbook(original));
    expect(workbook.worksheets.map((s) => s.name)).toEqual([
      'About',
      'Buses',
      'Sources',
      'Transformers',
      'Cables',
      'Motors',
      'Ties',
      'Devices',
      'Scenarios',
    ]);
    for (const sheet of workbook.worksheets) {
      expect(sheet.getRow(1).font?.bold).toBe(true);
      expect(sheet.views[0]).toEqual(expect.objectContaining({ state: 'frozen', ySplit: 1 }));
    }
    const buses = workbook.getWorksheet('Buses')!;
    expect(buses.getRow(1).values).toEqual([
      undefined,
      'id',
      'name',
      'nominalKv',
      'equipment.class',
      'equipment.electrodeConfig',
      'equipment.gapMm',
      'equipment.workingDistanceMm',
      'equipment.enclosureMm.height',
      'equipment.enclosureMm.width',
      'equipment.enclosureMm.depth',
      'equipment.mainIsolated',
      'equipment.arcDurationCapS',
      'equipment.arcDurationCapReason',
    ]);
    const devices = workbook.getWorksheet('Devices')!;
    expect(devices.getRow(1).values).toEqual([
      undefined,
      'id',
      'name',
      'branch',
      'end',
      'source',
      'device.kind',
      'device',
      'library',
      'onlyAt',
    ]);
    const about = workbook.getWorksheet('About')!;
    const aboutText = about
      .getSheetValues()
      .flat()
      .filter((v) => typeof v === 'string')
      .join(' ');
    expect(aboutText).toContain('as JSON');
    expect(about.getCell('A2').value).toBe('format');
    expect(about.getCell('B2').value).toBe('emberline-model');
    expect(about.getCell('A5').value).toBe('frequencyHz');
    expect(about.getCell('B5').value).toBe(60);
    // Booleans are real TRUE/FALSE cells; numbers are numbers.
    expect(workbook.getWorksheet('Ties')!.getCell('E2').value).toBe(false);
    expect(typeof buses.getCell('C2').value).toBe('number');
  });
});

describe('workbook import errors name the sheet, the row as Excel shows it and the column', () => {
  it('text in a number column: one error and no model', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const cables = wb.getWorksheet('Cables')!;
      cables.getCell(4, columnNumber(cables, 'lengthM')).value = 'twelve';
    });
    expect(errorsOf(result)).toEqual([
      {
        file: 'plant.xlsx',
        sheet: 'Cables',
        row: 4,
        column: 'lengthM (E)',
        where: 'Cables row 4, lengthM (E)',
        message: 'Enter a number',
      },
    ]);
  });

  it('an unknown bus is mapped back to its cell, and the island it leaves to the bus row', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const cables = wb.getWorksheet('Cables')!;
      cables.getCell(2, columnNumber(cables, 'toBus')).value = 'MCC-9';
    });
    const errors = errorsOf(result);
    expect(errors).toContainEqual({
      file: 'plant.xlsx',
      sheet: 'Cables',
      row: 2,
      column: 'toBus (D)',
      path: 'cables[0].toBus',
      elementId: 'FDR-3',
      where: 'Cables row 2, toBus (D)',
      message: 'unknown bus "MCC-9"',
    });
    // MCC-2 and PNL-8 are now fed by nothing: the island is reported on MCC-2's row (4th bus, row 5).
    expect(errors).toContainEqual(
      expect.objectContaining({ sheet: 'Buses', row: 5, column: 'id (A)', elementId: 'MCC-2' }),
    );
    expect(errors).toHaveLength(2);
  });

  it('empty rows are skipped but keep Excel row numbers', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const cables = wb.getWorksheet('Cables')!;
      cables.spliceRows(3, 0, []); // a blank row 3: FDR-4 moves to row 4
      cables.getCell(4, columnNumber(cables, 'fromBus')).value = 'SWBD-9';
    });
    const errors = errorsOf(result);
    // FDR-4 no longer feeds PNL-7 (5th bus, row 6), which is reported as an island.
    expect(errors.map((e) => [e.where, e.message])).toEqual([
      ['Cables row 4, fromBus (C)', 'unknown bus "SWBD-9"'],
      ['Buses row 6, id (A)', 'no source (utility or generator) reaches bus "PNL-7"'],
    ]);
  });

  it('numeric strings, yes/no and blank rows give the same model', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const cables = wb.getWorksheet('Cables')!;
      cables.spliceRows(3, 0, [], []);
      cables.getCell(2, columnNumber(cables, 'lengthM')).value = '45';
      cables.getCell(2, columnNumber(cables, 'sets')).value = '2';
      wb.getWorksheet('Ties')!.getCell(2, 5).value = 'No';
      const buses = wb.getWorksheet('Buses')!;
      buses.getCell(2, columnNumber(buses, 'equipment.mainIsolated')).value = 'yes';
      buses.getCell(2, columnNumber(buses, 'nominalKv')).value = '12.47';
    });
    expectSame(modelOf(result), original);
  });

  it('an unknown sheet name is an error; a blank extra sheet is ignored', async () => {
    const result = await editedWorkbook(original, (wb) => {
      wb.addWorksheet('Cabels').addRow(['id', 'fromBus']);
      wb.addWorksheet('Scratch');
    });
    expect(errorsOf(result)).toEqual([
      expect.objectContaining({ file: 'plant.xlsx', sheet: 'Cabels', where: 'Cabels' }),
    ]);
    expect(result.ok ? '' : result.errors[0].message).toMatch(/^Unknown sheet "Cabels": use About, Buses, /);
  });

  it('a misspelt header is an unknown column, on row 1 with its letter', async () => {
    const result = await editedWorkbook(original, (wb) => {
      wb.getWorksheet('Motors')!.getCell('D1').value = 'horsepower';
    });
    expect(errorsOf(result)).toEqual([
      expect.objectContaining({
        sheet: 'Motors',
        row: 1,
        column: 'horsepower (D)',
        where: 'Motors row 1, horsepower (D)',
      }),
    ]);
  });

  it('a value in a column without a header is reported', async () => {
    const result = await editedWorkbook(original, (wb) => {
      wb.getWorksheet('Ties')!.getCell('G2').value = 'stray';
    });
    expect(errorsOf(result)).toEqual([expect.objectContaining({ sheet: 'Ties', row: 2, column: '(G)' })]);
  });

  it('device.kind must agree with the device JSON; bad JSON names the device column', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const devices = wb.getWorksheet('Devices')!;
      devices.getCell(2, columnNumber(devices, 'device.kind')).value = 'fuse'; // the JSON says relay
      devices.getCell(3, columnNumber(devices, 'device')).value = '{"kind": "fuse", "ratingA": 125,';
    });
    const errors = errorsOf(result);
    expect(errors.map((e) => e.where)).toEqual(['Devices row 2, device.kind (F)', 'Devices row 3, device (G)']);
    expect(errors[0].message).toBe('Does not match the device column');
    expect(errors[1].message).toMatch(/^Enter a JSON object/);
  });

  it('a zod problem inside the device JSON is located on the device column', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const devices = wb.getWorksheet('Devices')!;
      const cell = devices.getCell(3, columnNumber(devices, 'device'));
      cell.value = String(cell.value).replace('"ratingA":125', '"ratingA":-125');
    });
    expect(errorsOf(result)).toEqual([
      expect.objectContaining({
        sheet: 'Devices',
        row: 3,
        column: 'device (G)',
        path: 'devices[1].device.ratingA',
        elementId: 'F-TX2-P',
      }),
    ]);
  });

  it('a generator field on a utility row is caught', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const sources = wb.getWorksheet('Sources')!;
      sources.getCell(2, columnNumber(sources, 'kva')).value = 2500;
    });
    expect(errorsOf(result)).toEqual([
      expect.objectContaining({
        sheet: 'Sources',
        row: 2,
        column: 'kva (H)',
        message: 'kva applies to kind generator only',
      }),
    ]);
  });

  it('About: an unknown field and a frequency that is not 50 or 60 are located on their rows', async () => {
    const unknown = await editedWorkbook(original, (wb) => {
      wb.getWorksheet('About')!.getCell('A4').value = 'nmae';
    });
    expect(errorsOf(unknown)).toEqual([expect.objectContaining({ sheet: 'About', row: 4, column: 'field (A)' })]);
    const frequency = await editedWorkbook(original, (wb) => {
      wb.getWorksheet('About')!.getCell('B5').value = 55;
    });
    expect(errorsOf(frequency)).toEqual([
      expect.objectContaining({
        sheet: 'About',
        row: 5,
        column: 'value (B)',
        path: 'frequencyHz',
        where: 'About row 5, value (B)',
      }),
    ]);
  });

  it('a blank required cell and a date cell are errors', async () => {
    const result = await editedWorkbook(original, (wb) => {
      const transformers = wb.getWorksheet('Transformers')!;
      transformers.getCell(2, columnNumber(transformers, 'kva')).value = null;
      transformers.getCell(3, columnNumber(transformers, 'impedancePct')).value = new Date(Date.UTC(2024, 0, 6));
    });
    expect(errorsOf(result).map((e) => [e.where, e.message])).toEqual([
      ['Transformers row 2, kva (E)', 'Enter a value'],
      ['Transformers row 3, impedancePct (H)', 'This cell holds a date: enter a number or plain text'],
    ]);
  });

  it('a missing sheet is named', async () => {
    const result = await editedWorkbook(original, (wb) => wb.removeWorksheet(wb.getWorksheet('Buses')!.id));
    expect(errorsOf(result)).toEqual([
      { file: 'plant.xlsx', sheet: 'Buses', path: 'buses', where: 'Buses', message: 'Give at least one bus' },
    ]);
  });

  it('a file that is not a workbook', async () => {
    const result = await importModel([{ name: 'plant.xlsx', buffer: Buffer.from('not a zip') }]);
    expect(errorsOf(result)).toEqual([
      { file: 'plant.xlsx', where: 'plant.xlsx', message: 'Not a readable .xlsx workbook' },
    ]);
  });
});

describe('CSV import errors name the file, the line and the column', () => {
  const csv = exportModelCsv(original);
  const files = (overrides: Partial<Record<ModelTable, string>>) =>
    MODEL_TABLES.map((t) => ({ name: `${t}.csv`, text: overrides[t] ?? csv[t] }));

  it('a missing required column', () => {
    const rows = Papa.parse<Record<string, string>>(csv.cables, { header: true, skipEmptyLines: true });
    const fields = rows.meta.fields!.filter((f) => f !== 'lengthM');
    const text = Papa.unparse({ fields, data: rows.data.map((r) => fields.map((f) => r[f])) });
    const result = importModelCsv(files({ cables: text }));
    expect(result).toEqual({
      ok: false,
      errors: [
        {
          file: 'cables.csv',
          row: 1,
          column: 'lengthM',
          where: 'cables.csv line 1, lengthM',
          message: 'Missing required column "lengthM"',
        },
      ],
    });
  });

  it('a missing table is named by the file it needs', async () => {
    const result = await importModel(
      files({})
        .filter((f) => f.name !== 'buses.csv')
        .map((f) => ({ name: f.name, buffer: Buffer.from(f.text) })),
    );
    expect(errorsOf(result)).toEqual([
      { file: 'buses.csv', path: 'buses', where: 'buses.csv', message: 'Give at least one bus' },
    ]);
  });

  it('line numbers count the lines of a quoted multi-line cell', async () => {
    // buses.csv: header on line 1, SWGR-A on line 2 with a two-line name (lines 2-3), SWGR-B on line 4.
    const buses = csv.buses
      .replace('"Main switchgear, ""A"" side"', '"Main switchgear,\r\n""A"" side"')
      .replace(',Generator switchgear,12.47,', ',Generator switchgear,twelve,');
    const result = importModelCsv(files({ buses }));
    expect(result.ok ? [] : result.errors).toEqual([
      expect.objectContaining({
        file: 'buses.csv',
        row: 4,
        column: 'nominalKv (C)',
        where: 'buses.csv line 4, nominalKv (C)',
        message: 'Enter a number',
      }),
    ]);
  });

  it('an unknown bus is mapped to file, line and column', async () => {
    const motors = csv.motors.replace('P-101,,MCC-2,', 'P-101,,MCC-9,');
    const result = await importModel(files({ motors }).map((f) => ({ name: f.name, buffer: Buffer.from(f.text) })));
    expect(errorsOf(result)).toEqual([
      {
        file: 'motors.csv',
        row: 2,
        column: 'bus (C)',
        path: 'motors[0].bus',
        elementId: 'P-101',
        where: 'motors.csv line 2, bus (C)',
        message: 'unknown bus "MCC-9"',
      },
    ]);
  });

  it('file names pick the table case-insensitively; unknown and doubled names are errors', () => {
    expect(tableOfFileName('Buses.csv')).toBe('buses');
    expect(tableOfFileName('CABLES.CSV')).toBe('cables');
    expect(tableOfFileName('Plant 2 - devices.csv')).toBe('devices');
    expect(tableOfFileName('ties (1).csv')).toBe('ties');
    expect(tableOfFileName('cabels.csv')).toBeUndefined();
    const result = importModelCsv([
      { name: 'Buses.csv', text: csv.buses },
      { name: 'cabels.csv', text: csv.cables },
      { name: 'buses (1).csv', text: csv.buses },
    ]);
    expect(result.ok ? [] : result.errors.map((e) => e.file)).toEqual(['cabels.csv', 'buses (1).csv']);
  });

  it('text that a spreadsheet would run as a formula is escaped on export and restored on import', () => {
    expect(csv.buses).toContain(`"'=lighting panel"`);
    expect(csv.cables).toContain(`"'-480 V lighting feeder"`);
    expect(csv.devices).toContain('"{""kind"":""relay""'); // device JSON is quoted, not escaped
  });

  it('a file saved as Windows-1252 by a spreadsheet is read', async () => {
    const buses = 'id,nominalKv,name\r\nB,0.48,Caf\xe9 panel\r\n';
    const sources = 'id,kind,bus,shortCircuitKa,xr\r\nU,utility,B,30,5\r\n';
    const result = await importModel([
      { name: 'buses.csv', buffer: Buffer.from(buses, 'latin1') },
      { name: 'sources.csv', buffer: Buffer.from(sources, 'latin1') },
    ]);
    expect(modelOf(result).buses[0].name).toBe('Café panel');
  });
});

describe('JSON import', () => {
  it('a syntax error is reported with its line and column', () => {
    const text = '{\n  "format": "emberline-model",\n  "version": 1,\n}\n';
    expect(importModelJson(text, 'plant.json')).toEqual({
      ok: false,
      errors: [
        {
          file: 'plant.json',
          line: 4,
          col: 1,
          where: 'plant.json line 4, column 1',
          message: 'JSON syntax error: Trailing comma before "}"',
        },
      ],
    });
    const missingComma = '{\n  "format": "emberline-model"\n  "version": 1\n}';
    expect(importModelJson(missingComma, 'plant.json')).toEqual({
      ok: false,
      errors: [
        expect.objectContaining({
          line: 3,
          col: 3,
          message: 'JSON syntax error: Expected "," or "}" after the property value, found """',
        }),
      ],
    });
  });

  it('the syntax locator agrees with JSON.parse on what is valid', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        expect(findJsonSyntaxError(JSON.stringify(value, null, 2))).toBeNull();
      }),
      { numRuns: 200 },
    );
    for (const bad of [
      '',
      '{',
      '[1,]',
      '{"a":1,}',
      '{"a" 1}',
      "{'a':1}",
      '[1 2]',
      '"\\x"',
      'nul',
      '01',
      '1.',
      '{"a":1}}',
    ]) {
      expect(() => JSON.parse(bad)).toThrow();
      expect(findJsonSyntaxError(bad)).not.toBeNull();
    }
  });

  it('model problems are located by their JSON path', async () => {
    const input = plant();
    input.cables![1] = { ...input.cables![1], toBus: 'MCC-9' };
    const result = await importModel([{ name: 'plant.json', buffer: Buffer.from(JSON.stringify(input)) }]);
    expect(errorsOf(result)).toContainEqual({
      file: 'plant.json',
      path: 'cables[1].toBus',
      elementId: 'FDR-4',
      where: 'plant.json cables[1].toBus (FDR-4)',
      message: 'unknown bus "MCC-9"',
    });
  });

  it('a JSON value that is not an object', () => {
    expect(importModelJson('[1, 2]', 'm.json')).toEqual({
      ok: false,
      errors: [expect.objectContaining({ file: 'm.json' })],
    });
  });

  it('the export is the pretty-printed model', () => {
    expect(JSON.parse(exportModelJson(original))).toEqual(JSON.parse(JSON.stringify(original)));
  });
});

describe('choosing the format', () => {
  it('by extension, else by MIME type; mixed or unsupported uploads are errors', async () => {
    const json = Buffer.from(exportModelJson(original));
    expect((await importModel([{ name: 'upload', mimeType: 'application/json', buffer: json }])).ok).toBe(true);
    expect(errorsOf(await importModel([{ name: 'plant.txt', buffer: json }]))[0].message).toMatch(
      /^Unsupported file type/,
    );
    expect(
      errorsOf(
        await importModel([
          { name: 'plant.json', buffer: json },
          { name: 'buses.csv', buffer: json },
        ]),
      ),
    ).toHaveLength(1);
    expect(
      errorsOf(
        await importModel([
          { name: 'a.json', buffer: json },
          { name: 'b.json', buffer: json },
        ]),
      ),
    ).toHaveLength(1);
    expect(errorsOf(await importModel([]))).toHaveLength(1);
  });

  it('CSV export needs the table', async () => {
    await expect(exportModel(original, 'csv')).rejects.toBeInstanceOf(EngineError);
    const file = await exportModel(original, 'csv', 'ties');
    expect(file).toEqual({
      filename: 'ties.csv',
      mimeType: 'text/csv; charset=utf-8',
      body: expect.stringMatching(/^\uFEFFid,name,fromBus,toBus,closed\r\n/),
    });
  });
});
