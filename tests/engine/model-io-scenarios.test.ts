import ExcelJS from 'exceljs';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import {
  MODEL_TABLES,
  exportModel,
  exportModelCsv,
  exportModelJson,
  exportModelWorkbook,
  importModel,
  type ImportError,
  type ImportModelResult,
  type ModelTable,
} from '../../server/io';

/*
 * Operating scenarios in the model files (docs/MODEL-FORMAT.md, Operating scenarios and Import and export): the JSON
 * array as it is, and in the workbook and CSV files a Scenarios table of one row per scenario and element it
 * overrides. These are the product's own file-format conventions (common practice, no source): no published value
 * is involved. Every number in the fixtures is a short decimal that text keeps exactly, so a round trip is compared
 * for identity.
 */

/**
 * A double-ended plant: a utility on one 12.47 kV switchgear, a standby generator on the other, a closed tie
 * between them, a 480 V switchboard and an MCC with two motors, and a second (open) tie for the loop check.
 */
function plant(scenarios?: ModelInput['scenarios']): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Double-ended plant',
    frequencyHz: 60,
    buses: [
      { id: 'SWGR-A', nominalKv: 12.47, equipment: { class: 'switchgear-15kv' } },
      { id: 'SWGR-B', nominalKv: 12.47, equipment: { class: 'switchgear-15kv' } },
      { id: 'SWBD-1', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } },
      { id: 'MCC-2', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } },
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
    ],
    cables: [{ id: 'FDR-3', fromBus: 'SWBD-1', toBus: 'MCC-2', lengthM: 45, rOhmPerKm: 0.25, xOhmPerKm: 0.125 }],
    motors: [
      { id: 'P-101', bus: 'MCC-2', hp: 150, kv: 0.46 },
      { id: 'P-102', bus: 'MCC-2', hp: 75, kv: 0.46 },
    ],
    ties: [
      { id: 'TIE-AB', fromBus: 'SWGR-A', toBus: 'SWGR-B', closed: true },
      { id: 'TIE-AB2', name: 'Spare tie', fromBus: 'SWGR-A', toBus: 'SWGR-B', closed: false },
    ],
    devices: [],
    ...(scenarios ? { scenarios } : {}),
  };
}

/** One scenario of each kind the issue names, and the model's other possibilities (kA, a motor kept running). */
const SCENARIOS: ModelInput['scenarios'] = [
  { id: 'util-min', name: 'Utility minimum', sources: { 'UTIL-1': { shortCircuitMva: 150, xr: 8 } } },
  { id: 'tie-open', name: 'Tie open', ties: { 'TIE-AB': { closed: false } } },
  {
    id: 'gen-only',
    name: 'Standby generator alone, motors stopped',
    sources: { 'UTIL-1': { inService: false }, 'GEN-1': { xr: 30 } },
    allMotorsOff: true,
  },
  { id: 'p101-off', motors: { 'P-101': { inService: false } } },
  {
    id: 'util-ka',
    name: 'Utility by kA, one motor kept',
    sources: { 'UTIL-1': { shortCircuitKa: 9.5 } },
    motors: { 'P-102': { inService: true } },
    allMotorsOff: true,
  },
  { id: 'as-written', name: 'Named only', allMotorsOff: false },
];

function parsed(input: ModelInput): Model {
  const result = parseModel(input);
  if (!result.success) throw new Error(`fixture does not parse: ${JSON.stringify(result.issues)}`);
  return result.model;
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

async function viaFormat(model: Model, format: 'json' | 'xlsx'): Promise<ImportModelResult> {
  const file = await exportModel(model, format);
  return importModel([{ name: file.filename, buffer: asBuffer(file.body) }]);
}

async function csvUpload(model: Model) {
  return Promise.all(
    MODEL_TABLES.map(async (table) => {
      const file = await exportModel(model, 'csv', table);
      return { name: file.filename, mimeType: file.mimeType, buffer: asBuffer(file.body) };
    }),
  );
}

/** The CSV files of a model with one table's text replaced. */
function csvFiles(model: Model, overrides: Partial<Record<ModelTable, string>>) {
  const csv = exportModelCsv(model);
  return MODEL_TABLES.map((t) => ({ name: `${t}.csv`, buffer: Buffer.from(overrides[t] ?? csv[t]) }));
}

const SCENARIO_HEADER = 'scenario,scenarioName,allMotorsOff,element,inService,shortCircuitMva,shortCircuitKa,xr,closed';

/** A workbook of the model whose Scenarios sheet holds the given rows under its header (the columns above). */
async function workbookWith(model: Model, rows: (string | number | boolean | null)[][]) {
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load((await exportModelWorkbook(model)) as unknown as ExcelJS.Buffer);
  const sheet = workbook.getWorksheet('Scenarios')!;
  sheet.spliceRows(2, sheet.rowCount);
  for (const row of rows) sheet.addRow(row);
  const buffer = Buffer.from((await workbook.xlsx.writeBuffer()) as unknown as ArrayBuffer);
  return importModel([{ name: 'plant.xlsx', buffer }]);
}

const base = parsed(plant());
const withScenarios = parsed(plant(SCENARIOS));

describe('scenarios round trip (common practice, no source: export then import gives the same model)', () => {
  it('the fixture holds every kind of override and is a valid model', () => {
    expect(withScenarios.scenarios).toHaveLength(6);
    expect(withScenarios.scenarios![0].sources!['UTIL-1'].shortCircuitMva).toBe(150);
  });

  it.each(['json', 'xlsx'] as const)('%s', async (format) => {
    expect(modelOf(await viaFormat(withScenarios, format))).toEqual(withScenarios);
  });

  it('CSV, scenarios.csv beside the other tables', async () => {
    const upload = await csvUpload(withScenarios);
    expect(upload.map((f) => f.name)).toContain('scenarios.csv');
    expect(modelOf(await importModel(upload))).toEqual(withScenarios);
  });

  it('JSON carries the array as written', () => {
    expect(JSON.parse(exportModelJson(withScenarios)).scenarios).toEqual(SCENARIOS);
  });

  it('one row per scenario and element, the scenario’s own fields on its first row', () => {
    // The layout stated in docs/MODEL-FORMAT.md (Import and export), written out here.
    expect(exportModelCsv(withScenarios).scenarios.split('\r\n')).toEqual([
      SCENARIO_HEADER,
      'util-min,Utility minimum,,UTIL-1,,150,,8,',
      'tie-open,Tie open,,TIE-AB,,,,,false',
      'gen-only,"Standby generator alone, motors stopped",true,UTIL-1,false,,,,',
      'gen-only,,,GEN-1,,,,30,',
      'p101-off,,,P-101,false,,,,',
      'util-ka,"Utility by kA, one motor kept",true,UTIL-1,,,9.5,,',
      'util-ka,,,P-102,true,,,,',
      'as-written,Named only,false,,,,,,',
      '',
    ]);
  });

  it('a model without scenarios: a Scenarios table of its header only, and no scenarios key back', async () => {
    expect(base).not.toHaveProperty('scenarios');
    expect(JSON.parse(exportModelJson(base))).not.toHaveProperty('scenarios');
    // The header and no data line, as for any empty table (the plant has no devices either).
    const csv = exportModelCsv(base);
    expect(csv.scenarios.split('\r\n').filter(Boolean)).toEqual([SCENARIO_HEADER]);
    expect(csv.devices.split('\r\n').filter(Boolean)).toHaveLength(1);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load((await exportModelWorkbook(base)) as unknown as ExcelJS.Buffer);
    const sheet = workbook.getWorksheet('Scenarios')!;
    expect(sheet.actualRowCount).toBe(1);
    expect(sheet.getRow(1).values).toEqual([undefined, ...SCENARIO_HEADER.split(',')]);
    for (const back of [
      modelOf(await viaFormat(base, 'json')),
      modelOf(await viaFormat(base, 'xlsx')),
      modelOf(await importModel(await csvUpload(base))),
    ]) {
      expect(back).not.toHaveProperty('scenarios');
      expect(back).toEqual(base);
    }
  });

  it('older files without a Scenarios sheet or scenarios.csv still import, without scenarios', async () => {
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load((await exportModelWorkbook(withScenarios)) as unknown as ExcelJS.Buffer);
    workbook.removeWorksheet(workbook.getWorksheet('Scenarios')!.id);
    const buffer = Buffer.from((await workbook.xlsx.writeBuffer()) as unknown as ArrayBuffer);
    expect(modelOf(await importModel([{ name: 'plant.xlsx', buffer }]))).toEqual(base);
    const csv = csvFiles(withScenarios, {}).filter((f) => f.name !== 'scenarios.csv');
    expect(modelOf(await importModel(csv))).toEqual(base);
  });

  it('rows written by hand: a scenario’s rows apart, its name on a later row or repeated, yes/no', async () => {
    const result = await workbookWith(base, [
      ['util-min', null, null, 'UTIL-1', null, 150, null, 8, null],
      ['p101-off', null, null, 'P-101', 'no', null, null, null, null],
      ['util-min', 'Utility minimum', 'yes', 'P-102', 'yes', null, null, null, null],
      ['util-min', 'Utility minimum', null, null, null, null, null, null, null],
    ]);
    expect(modelOf(result).scenarios).toEqual([
      {
        id: 'util-min',
        name: 'Utility minimum',
        allMotorsOff: true,
        sources: { 'UTIL-1': { shortCircuitMva: 150, xr: 8 } },
        motors: { 'P-102': { inService: true } },
      },
      { id: 'p101-off', motors: { 'P-101': { inService: false } } },
    ]);
  });
});

describe('Scenarios table errors name the sheet or file, the row and the column', () => {
  it('an id that is no source, tie or motor (a bus, a typo): workbook and CSV', async () => {
    const book = await workbookWith(base, [
      ['s1', null, null, 'SWGR-A', false, null, null, null, null],
      ['s1', null, null, 'NOPE', false, null, null, null, null],
    ]);
    expect(errorsOf(book).map((e) => [e.sheet, e.row, e.column, e.where])).toEqual([
      ['Scenarios', 2, 'element (D)', 'Scenarios row 2, element (D)'],
      ['Scenarios', 3, 'element (D)', 'Scenarios row 3, element (D)'],
    ]);
    expect(errorsOf(book)[1].message).toBe(
      'Unknown element "NOPE": give the id of a source, tie or motor of the model',
    );

    const csv = await importModel(csvFiles(base, { scenarios: `${SCENARIO_HEADER}\r\nutil-min,,,UTIL-9,,150,,,\r\n` }));
    expect(errorsOf(csv)).toEqual([
      {
        file: 'scenarios.csv',
        row: 2,
        column: 'element (D)',
        where: 'scenarios.csv line 2, element (D)',
        message: 'Unknown element "UTIL-9": give the id of a source, tie or motor of the model',
      },
    ]);
  });

  it('a field that does not apply to the element’s kind', async () => {
    const result = await workbookWith(base, [
      ['s1', null, null, 'UTIL-1', null, null, null, null, false], // closed on a source
      ['s1', null, null, 'TIE-AB', true, null, null, null, false], // inService on a tie
      ['s1', null, null, 'P-101', false, 10, null, 5, null], // MVA and X/R on a motor
    ]);
    expect(errorsOf(result).map((e) => [e.where, e.message])).toEqual([
      ['Scenarios row 2, closed (I)', 'closed applies to a tie; "UTIL-1" is a source'],
      ['Scenarios row 3, inService (E)', 'inService applies to a source or motor; "TIE-AB" is a tie'],
      ['Scenarios row 4, shortCircuitMva (F)', 'shortCircuitMva applies to a source; "P-101" is a motor'],
      ['Scenarios row 4, xr (H)', 'xr applies to a source; "P-101" is a motor'],
    ]);
  });

  it('a utility-only field on a generator: the model check, located on its cell', async () => {
    const result = await workbookWith(base, [
      ['gen', 'Generator', null, 'UTIL-1', false, null, null, null, null],
      ['gen', null, null, 'GEN-1', null, 20, null, null, null],
    ]);
    expect(errorsOf(result)).toEqual([
      {
        file: 'plant.xlsx',
        sheet: 'Scenarios',
        row: 3,
        column: 'shortCircuitMva (F)',
        path: 'scenarios[0].sources.GEN-1.shortCircuitMva',
        elementId: 'gen',
        where: 'Scenarios row 3, shortCircuitMva (F)',
        message: 'shortCircuitMva applies to a utility source; "GEN-1" is a generator',
      },
    ]);
  });

  it('shape problems (zod) inside an override are located on the element’s row and the field’s column', async () => {
    const result = await importModel(
      csvFiles(base, {
        scenarios: [
          SCENARIO_HEADER,
          'a,,,UTIL-1,,-150,,,', // not a physical value
          'b,,,UTIL-1,,150,6,,', // MVA and kA both
          'b,,,TIE-AB,,,,,', // a tie row without closed
          'base,,,P-101,false,,,,', // the base's own id
          '',
        ].join('\r\n'),
      }),
    );
    expect(errorsOf(result).map((e) => [e.where, e.path])).toEqual([
      ['scenarios.csv line 2, shortCircuitMva (F)', 'scenarios[0].sources.UTIL-1.shortCircuitMva'],
      ['scenarios.csv line 3, shortCircuitMva (F)', 'scenarios[1].sources.UTIL-1.shortCircuitMva'],
      ['scenarios.csv line 4, closed (I)', 'scenarios[1].ties.TIE-AB.closed'],
      ['scenarios.csv line 5, scenario (A)', 'scenarios[2].id'],
    ]);
  });

  it('a tie loop or no source in service in a scenario is located on the scenario', async () => {
    const result = await workbookWith(base, [
      ['loop', null, null, 'TIE-AB2', null, null, null, null, true],
      ['dark', 'Everything out', null, 'UTIL-1', false, null, null, null, null],
      ['dark', null, null, 'GEN-1', false, null, null, null, null],
    ]);
    expect(errorsOf(result).map((e) => [e.where, e.path, e.elementId])).toEqual([
      ['Scenarios row 2, element (D)', 'scenarios[0].ties.TIE-AB2', 'loop'],
      ['Scenarios row 3, scenario (A)', 'scenarios[1].sources', 'dark'],
    ]);
  });

  it('an element twice in a scenario, two names for one scenario, a value without its element', async () => {
    const result = await workbookWith(base, [
      ['s1', 'First', null, 'UTIL-1', null, 150, null, null, null],
      ['s1', 'Second', null, 'UTIL-1', null, null, null, 8, null],
      ['s1', null, null, null, false, null, null, null, null],
    ]);
    expect(errorsOf(result).map((e) => [e.where, e.message])).toEqual([
      ['Scenarios row 3, scenarioName (B)', 'Scenario "s1" has another scenarioName on row 2: give it once'],
      ['Scenarios row 3, element (D)', 'Scenario "s1" already changes "UTIL-1" on row 2: give it on one row'],
      ['Scenarios row 4, inService (E)', 'Give the element (a source, tie or motor id) that inService applies to'],
    ]);
  });

  it('a blank scenario id and an unknown column are refused like any other table’s', async () => {
    const blank = await workbookWith(base, [[null, 'No id', null, 'UTIL-1', false, null, null, null, null]]);
    expect(errorsOf(blank).map((e) => [e.where, e.message])).toEqual([
      ['Scenarios row 2, scenario (A)', 'Enter a value'],
    ]);
    const misspelt = await importModel(
      csvFiles(base, { scenarios: `${SCENARIO_HEADER.replace('closed', 'tieClosed')}\r\n` }),
    );
    expect(errorsOf(misspelt)).toEqual([
      expect.objectContaining({ file: 'scenarios.csv', row: 1, column: 'tieClosed (I)' }),
    ]);
  });

  it('ids with dots are found whole when a problem is located', async () => {
    const input = plant();
    input.sources![0] = { ...input.sources![0], id: 'UTIL.1' };
    const model = parsed(input);
    const result = await importModel(csvFiles(model, { scenarios: `${SCENARIO_HEADER}\r\nlow,,,UTIL.1,,0,,,\r\n` }));
    expect(errorsOf(result).map((e) => [e.where, e.path])).toEqual([
      ['scenarios.csv line 2, shortCircuitMva (F)', 'scenarios[0].sources.UTIL.1.shortCircuitMva'],
    ]);
  });
});

describe('JSON: the scenarios array passes through, checked like the rest of the model', () => {
  it('an unknown id is located by its path; an unknown key in an override is refused', async () => {
    const input = plant([
      { id: 'a', sources: { 'UTIL-1': { inService: false } } },
      { id: 'b', ties: { 'TIE-AB': { closed: false } } },
      { id: 'c', sources: { NOPE: { inService: false } } },
    ]);
    const unknown = await importModel([{ name: 'plant.json', buffer: Buffer.from(JSON.stringify(input)) }]);
    expect(errorsOf(unknown)).toEqual([
      {
        file: 'plant.json',
        path: 'scenarios[2].sources.NOPE',
        elementId: 'c',
        where: 'plant.json scenarios[2].sources.NOPE (c)',
        message: 'unknown source "NOPE"',
      },
    ]);
    const typo = JSON.stringify(plant([{ id: 'a', ties: { 'TIE-AB': { closed: false } } }])).replace(
      '"closed":false}}',
      '"closed":false,"clsoed":true}}',
    );
    const strict = errorsOf(await importModel([{ name: 'plant.json', buffer: Buffer.from(typo) }]));
    expect(strict).toHaveLength(1);
    expect(strict[0]).toMatchObject({ file: 'plant.json', elementId: 'a' });
    expect(strict[0].path).toMatch(/^scenarios\[0\]\.ties\.TIE-AB/);
    // The unknown key is named, in the path or in the message.
    expect(`${strict[0].path} ${strict[0].message}`).toContain('clsoed');
  });
});
