/**
 * The flat tables of the model (workbook sheets and CSV files) are generated from the zod shapes of the model.
 * Expected headers are the field lists of the JSON format as docs/MODEL-FORMAT.md states them (source: that
 * document, sections Buses … Devices and "Import and export"), written out here independently of the schema.
 */
import { TABLE_COLUMNS, type ElementTable } from '../../server/io/columns';

// docs/MODEL-FORMAT.md, one list per element type; nested fields joined by dots ("Import and export").
const FORMAT_FIELDS: Record<ElementTable, string[]> = {
  buses: [
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
  ],
  sources: [
    'id',
    'name',
    'kind',
    'bus',
    'shortCircuitMva',
    'shortCircuitKa',
    'xr',
    'kva',
    'kv',
    'subtransientPct',
    'transientPct',
    'synchronousPct',
    'sustainedCurrentMultiple',
    'subtransientTimeConstantS',
    'transientTimeConstantS',
  ],
  transformers: ['id', 'name', 'fromBus', 'toBus', 'kva', 'primaryKv', 'secondaryKv', 'impedancePct', 'xr'],
  cables: [
    'id',
    'name',
    'fromBus',
    'toBus',
    'lengthM',
    'sets',
    'size',
    'material',
    'conduit',
    'rOhmPerKm',
    'xOhmPerKm',
  ],
  motors: [
    'id',
    'name',
    'bus',
    'hp',
    'kva',
    'kv',
    'lockedRotorMultiple',
    'subtransientPct',
    'firstCycleMultiplier',
    'rpm',
    'xr',
  ],
  ties: ['id', 'name', 'fromBus', 'toBus', 'closed'],
  // The device object and the library reference as JSON; device.kind repeated for sorting.
  devices: ['id', 'name', 'branch', 'end', 'source', 'device.kind', 'device', 'library', 'onlyAt'],
};

// docs/MODEL-FORMAT.md, Operating scenarios: one row per scenario and element it overrides. The scenario's own
// fields (id as scenario, name as scenarioName, allMotorsOff), the element's id, then the override fields, each with
// the kinds of element it applies to: a source's inService, shortCircuitMva or shortCircuitKa and xr, a tie's closed,
// a motor's inService.
const SCENARIO_COLUMNS: [string, string[] | undefined][] = [
  ['scenario', undefined],
  ['scenarioName', undefined],
  ['allMotorsOff', undefined],
  ['element', undefined],
  ['inService', ['source', 'motor']],
  ['shortCircuitMva', ['source']],
  ['shortCircuitKa', ['source']],
  ['xr', ['source']],
  ['closed', ['tie']],
];

const byHeader = (table: ElementTable | 'scenarios') => new Map(TABLE_COLUMNS[table].map((c) => [c.header, c]));

describe('model tables generated from the zod shapes', () => {
  it('every field of the JSON format is a column, and nothing else (docs/MODEL-FORMAT.md)', () => {
    for (const table of Object.keys(FORMAT_FIELDS) as ElementTable[]) {
      const headers = TABLE_COLUMNS[table].map((c) => c.header);
      expect([...headers].sort()).toEqual([...FORMAT_FIELDS[table]].sort());
      expect(new Set(headers).size).toBe(headers.length);
      for (const c of TABLE_COLUMNS[table]) expect(c.path).toEqual(c.header.split('.'));
    }
  });

  it('sources: utility and generator fields apply only to their kind; id, kind, bus and xr to both', () => {
    // docs/MODEL-FORMAT.md, Sources: utility shortCircuitMva or shortCircuitKa and xr; generator kva, kv,
    // subtransientPct, xr and the optional decrement data.
    const cols = byHeader('sources');
    for (const h of ['shortCircuitMva', 'shortCircuitKa']) {
      expect(cols.get(h)?.when).toEqual({ column: 'kind', values: ['utility'] });
      expect(cols.get(h)?.required).toBeUndefined();
    }
    for (const h of [
      'kva',
      'kv',
      'subtransientPct',
      'transientPct',
      'synchronousPct',
      'sustainedCurrentMultiple',
      'subtransientTimeConstantS',
      'transientTimeConstantS',
    ]) {
      expect(cols.get(h)?.when).toEqual({ column: 'kind', values: ['generator'] });
      // kva is required of a generator, but a utility row leaves it empty: the column is not required.
      expect(cols.get(h)?.required).toBeUndefined();
    }
    for (const h of ['id', 'kind', 'bus', 'xr']) {
      expect(cols.get(h)?.when).toBeUndefined();
      expect(cols.get(h)?.required).toBe(true);
    }
    expect(cols.get('name')?.required).toBeUndefined();
  });

  it('types and required columns follow the shapes', () => {
    const buses = byHeader('buses');
    expect(buses.get('nominalKv')).toMatchObject({ type: 'number', required: true });
    // equipment is optional, so none of its fields is a required column, though class is required within it.
    for (const [h, c] of buses) if (h.startsWith('equipment.')) expect(c.required).toBeUndefined();
    // MODEL-FORMAT.md: arcDurationCapS is a number or null (no cap).
    expect(buses.get('equipment.arcDurationCapS')?.type).toBe('number-or-none');
    expect(buses.get('equipment.mainIsolated')?.type).toBe('boolean');
    expect(buses.get('equipment.electrodeConfig')?.type).toBe('string');
    // Fields with a default (sets 1, closed true) may be left empty.
    expect(byHeader('cables').get('sets')).toMatchObject({ type: 'number' });
    expect(byHeader('cables').get('sets')?.required).toBeUndefined();
    expect(byHeader('ties').get('closed')).toMatchObject({ type: 'boolean' });
    expect(byHeader('ties').get('closed')?.required).toBeUndefined();
    const devices = byHeader('devices');
    expect(devices.get('device')).toMatchObject({ type: 'json', required: true });
    expect(devices.get('library')?.type).toBe('json');
    expect(devices.get('onlyAt')?.type).toBe('json');
    expect(devices.get('device.kind')?.type).toBe('string');
    expect(devices.get('device.kind')?.required).toBeUndefined();
  });

  it('scenarios: one column per scenario field, the element, and each override field once (docs/MODEL-FORMAT.md)', () => {
    expect(TABLE_COLUMNS.scenarios.map((c) => [c.header, c.elementKinds])).toEqual(SCENARIO_COLUMNS);
    const cols = byHeader('scenarios');
    expect(cols.get('scenario')).toMatchObject({ type: 'string', required: true });
    for (const h of ['scenarioName', 'element']) expect(cols.get(h)).toMatchObject({ type: 'string' });
    for (const h of ['allMotorsOff', 'inService', 'closed']) expect(cols.get(h)).toMatchObject({ type: 'boolean' });
    for (const h of ['shortCircuitMva', 'shortCircuitKa', 'xr']) expect(cols.get(h)).toMatchObject({ type: 'number' });
    // Only the scenario id is needed on every row; a tie row without closed is refused by the model check instead.
    for (const [h, c] of cols) if (h !== 'scenario') expect(c.required).toBeUndefined();
    // Common practice, no source: every column of the table has its help note.
    for (const c of TABLE_COLUMNS.scenarios) expect(c.note).toEqual(expect.any(String));
  });

  it('every column of a value a spreadsheet user fills in has its help note, and the notes name real columns', () => {
    // Common practice, no source: a header note on every measured quantity, so the unit is never a guess.
    const withUnits = ['nominalKv', 'lengthM', 'kva', 'kv', 'impedancePct', 'equipment.gapMm'];
    for (const table of Object.keys(FORMAT_FIELDS) as ElementTable[]) {
      for (const c of TABLE_COLUMNS[table]) {
        if (withUnits.includes(c.header)) expect(c.note).toEqual(expect.any(String));
      }
    }
  });
});
