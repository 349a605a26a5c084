import { modelSchema, parseModel, validateModel, type ModelInput, type ModelIssue } from '../../shared/schemas/model';

/*
 * The system model format and its checks (docs/MODEL-FORMAT.md, Validation): unknown references, duplicate ids, islands
 * without a source and non-physical values are rejected with an error naming the element and field. These are the
 * product's own format rules, not published values; no float is compared here.
 */

const fuse = {
  kind: 'fuse' as const,
  ratingA: 400,
  totalClearing: [
    [800, 100],
    [4000, 0.1],
  ] as [number, number][],
};

/** The example of docs/MODEL-FORMAT.md, completed with the buses it refers to. */
function example(): ModelInput {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [
      {
        id: 'SWGR-A',
        name: 'Main switchgear',
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
      { id: 'SWBD-1', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } },
      { id: 'MCC-2', nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep', mainIsolated: false } },
    ],
    sources: [{ id: 'UTIL-1', bus: 'SWGR-A', kind: 'utility', shortCircuitMva: 250, xr: 10 }],
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
    ],
    motors: [{ id: 'P-101', bus: 'MCC-2', hp: 150, kv: 0.46 }],
    devices: [{ id: 'CB-TX1-S', branch: 'TX-1', end: 'to', name: 'Secondary main', device: fuse }],
  };
}

const issuesOf = (input: unknown): ModelIssue[] => {
  const result = parseModel(input);
  return result.success ? [] : result.issues;
};

describe('the example of docs/MODEL-FORMAT.md', () => {
  it('parses and passes every check', () => {
    const result = parseModel(example());
    expect(result.issues).toEqual([]);
    expect(result.success).toBe(true);
  });

  it('fills defaults: empty element lists, one set per cable, closed ties', () => {
    const model = modelSchema.parse({
      format: 'emberline-model',
      version: 1,
      buses: [
        { id: 'A', nominalKv: 0.48 },
        { id: 'B', nominalKv: 0.48 },
      ],
      sources: [{ id: 'U', kind: 'utility', bus: 'A', shortCircuitKa: 30, xr: 5 }],
      cables: [{ id: 'C', fromBus: 'A', toBus: 'B', lengthM: 10, rOhmPerKm: 0.1, xOhmPerKm: 0.08 }],
      ties: [{ id: 'T', fromBus: 'A', toBus: 'B' }],
    });
    expect(model.frequencyHz).toBe(60);
    expect(model.cables[0].sets).toBe(1);
    expect(model.ties[0].closed).toBe(true);
    expect(model.motors).toEqual([]);
    expect(model.devices).toEqual([]);
  });
});

describe('non-physical values (zod)', () => {
  it.each([
    ['cables', 0, 'lengthM', -45],
    ['cables', 0, 'lengthM', 0],
    ['transformers', 0, 'kva', Number.POSITIVE_INFINITY],
    ['transformers', 0, 'impedancePct', Number.NaN],
    ['motors', 0, 'kv', -0.46],
  ] as const)('%s[%d].%s = %s is rejected, naming the element and field', (collection, index, field, value) => {
    const input = example() as Record<string, unknown>;
    const items = input[collection] as Record<string, unknown>[];
    items[index] = { ...items[index], [field]: value };
    const issues = issuesOf(input);
    const issue = issues.find((i) => i.path === `${collection}[${index}].${field}`);
    expect(issue).toBeDefined();
    expect(issue!.elementId).toBe(items[index].id);
    expect(issue!.field).toBe(field);
    expect(issue!.code).toBe('invalid-value');
  });

  it('a bus voltage and a nested equipment value are named with their path', () => {
    const input = example();
    input.buses[0] = { ...input.buses[0], nominalKv: 0 };
    input.buses[1] = { ...input.buses[1], equipment: { class: 'switchgear-lv', gapMm: -1 } };
    const issues = issuesOf(input);
    expect(issues).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'buses[0].nominalKv', elementId: 'SWGR-A', field: 'nominalKv' }),
        expect.objectContaining({ path: 'buses[1].equipment.gapMm', elementId: 'SWBD-1', field: 'equipment.gapMm' }),
      ]),
    );
  });

  it('an unknown equipment class or electrode configuration is rejected', () => {
    const input = example();
    input.buses[1] = { ...input.buses[1], equipment: { class: 'toaster' as never, electrodeConfig: 'XYZ' as never } };
    const paths = issuesOf(input).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['buses[1].equipment.class', 'buses[1].equipment.electrodeConfig']));
  });

  it('wrong format or version is rejected', () => {
    expect(issuesOf({ ...example(), format: 'other' }).map((i) => i.path)).toContain('format');
    expect(issuesOf({ ...example(), version: 2 }).map((i) => i.path)).toContain('version');
  });

  it('a utility needs exactly one of shortCircuitMva or shortCircuitKa', () => {
    const both = example();
    both.sources![0] = {
      id: 'UTIL-1',
      bus: 'SWGR-A',
      kind: 'utility',
      shortCircuitMva: 250,
      shortCircuitKa: 11,
      xr: 10,
    };
    expect(issuesOf(both)).toEqual([
      expect.objectContaining({ path: 'sources[0].shortCircuitMva', elementId: 'UTIL-1' }),
    ]);
    const neither = example();
    neither.sources![0] = { id: 'UTIL-1', bus: 'SWGR-A', kind: 'utility', xr: 10 };
    expect(issuesOf(neither)).toEqual([expect.objectContaining({ path: 'sources[0].shortCircuitMva' })]);
  });

  it('a cable needs table data or explicit R and X, and a known conductor size', () => {
    const input = example();
    input.cables![0] = { id: 'FDR-3', fromBus: 'SWBD-1', toBus: 'MCC-2', lengthM: 45, size: '500', material: 'Cu' };
    expect(issuesOf(input)).toEqual([
      expect.objectContaining({ path: 'cables[0].conduit', elementId: 'FDR-3', field: 'conduit' }),
    ]);
    input.cables![0] = {
      id: 'FDR-3',
      fromBus: 'SWBD-1',
      toBus: 'MCC-2',
      lengthM: 45,
      size: '3/8',
      material: 'Cu',
      conduit: 'pvc',
    };
    expect(issuesOf(input)).toEqual([expect.objectContaining({ path: 'cables[0].size', field: 'size' })]);
    input.cables![0] = {
      id: 'FDR-3',
      fromBus: 'SWBD-1',
      toBus: 'MCC-2',
      lengthM: 45,
      size: '2',
      material: 'Cu',
      conduit: 'pvc',
      rOhmPerKm: 1,
    };
    expect(issuesOf(input)).toEqual([expect.objectContaining({ path: 'cables[0].rOhmPerKm' })]);
  });

  it('a motor needs exactly one of hp or kva; a device exactly one of branch or source, with an end on a branch', () => {
    const input = example();
    input.motors![0] = { id: 'P-101', bus: 'MCC-2', hp: 150, kva: 150, kv: 0.46 };
    input.devices![0] = { id: 'CB-TX1-S', branch: 'TX-1', device: fuse };
    const issues = issuesOf(input);
    expect(issues).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'motors[0].hp', elementId: 'P-101' }),
        expect.objectContaining({ path: 'devices[0].end', elementId: 'CB-TX1-S', field: 'end' }),
      ]),
    );
  });
});

describe('semantic checks (validateModel)', () => {
  it('an unknown bus names the element and the field', () => {
    const input = example();
    input.buses.push({ id: 'MCC-3', nominalKv: 0.48 });
    input.cables!.push(
      { id: 'FDR-1', fromBus: 'SWBD-1', toBus: 'MCC-3', lengthM: 10, size: '2', material: 'Cu', conduit: 'pvc' },
      { id: 'FDR-9', fromBus: 'SWBD-1', toBus: 'MCC-9', lengthM: 10, size: '2', material: 'Cu', conduit: 'pvc' },
    );
    expect(issuesOf(input)).toEqual([
      {
        code: 'unknown-reference',
        path: 'cables[2].toBus',
        elementId: 'FDR-9',
        field: 'toBus',
        message: 'unknown bus "MCC-9"',
      },
    ]);
  });

  it('unknown buses of sources, motors and transformers', () => {
    const input = example();
    input.sources![0] = { ...input.sources![0], bus: 'NOWHERE' };
    input.motors![0] = { ...input.motors![0], bus: 'NOWHERE-2' };
    input.transformers![0] = { ...input.transformers![0], fromBus: 'NOWHERE-3' };
    const paths = issuesOf(input)
      .filter((i) => i.code === 'unknown-reference')
      .map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['sources[0].bus', 'motors[0].bus', 'transformers[0].fromBus']));
  });

  it('duplicate ids across element kinds', () => {
    const input = example();
    input.cables![0] = { ...input.cables![0], id: 'TX-1' };
    input.devices!.push({ id: 'SWGR-A', source: 'UTIL-1', device: fuse });
    const dups = issuesOf(input).filter((i) => i.code === 'duplicate-id');
    expect(dups).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'cables[0].id', elementId: 'TX-1', field: 'id' }),
        expect.objectContaining({ path: 'devices[1].id', elementId: 'SWGR-A', field: 'id' }),
      ]),
    );
    expect(dups[0].message).toContain('transformers[0]');
  });

  it('an island without a source: the error names its buses', () => {
    const input = example();
    input.buses.push({ id: 'PNL-7', nominalKv: 0.208 }, { id: 'PNL-8', nominalKv: 0.208 });
    input.cables!.push({
      id: 'FDR-7',
      fromBus: 'PNL-7',
      toBus: 'PNL-8',
      lengthM: 10,
      size: '2',
      material: 'Cu',
      conduit: 'pvc',
    });
    const islands = issuesOf(input).filter((i) => i.code === 'island');
    expect(islands).toHaveLength(1);
    expect(islands[0].elementIds).toEqual(['PNL-7', 'PNL-8']);
    expect(islands[0].message).toContain('"PNL-7"');
    expect(islands[0].message).toContain('"PNL-8"');
    expect(islands[0].path).toBe('buses[3]');
  });

  it('a whole model without a source is one island', () => {
    const input = example();
    input.sources = [];
    const islands = issuesOf(input).filter((i) => i.code === 'island');
    expect(islands).toHaveLength(1);
    expect(islands[0].elementIds).toEqual(['SWGR-A', 'SWBD-1', 'MCC-2']);
  });

  it('an open tie does not connect; a closed one does', () => {
    const input = example();
    input.buses.push({ id: 'SWBD-2', nominalKv: 0.48 });
    input.ties = [{ id: 'TIE-1', fromBus: 'SWBD-1', toBus: 'SWBD-2', closed: false }];
    expect(issuesOf(input).map((i) => i.code)).toEqual(['island']);
    input.ties = [{ id: 'TIE-1', fromBus: 'SWBD-1', toBus: 'SWBD-2', closed: true }];
    expect(issuesOf(input)).toEqual([]);
  });

  it('closed ties forming a loop are rejected (indeterminate current split)', () => {
    const input = example();
    input.buses.push({ id: 'SWBD-2', nominalKv: 0.48 }, { id: 'SWBD-3', nominalKv: 0.48 });
    input.ties = [
      { id: 'TIE-1', fromBus: 'SWBD-1', toBus: 'SWBD-2' },
      { id: 'TIE-2', fromBus: 'SWBD-2', toBus: 'SWBD-3' },
      { id: 'TIE-3', fromBus: 'SWBD-3', toBus: 'SWBD-1' },
    ];
    expect(issuesOf(input)).toEqual([
      expect.objectContaining({ code: 'tie-loop', path: 'ties[2].closed', elementId: 'TIE-3' }),
    ]);
  });

  it('transformer ratings must match the buses within 5 %', () => {
    const input = example();
    input.transformers![0] = { ...input.transformers![0], secondaryKv: 0.46 }; // 4.2 %: accepted
    expect(issuesOf(input)).toEqual([]);
    input.transformers![0] = { ...input.transformers![0], primaryKv: 4.16, secondaryKv: 0.208 };
    const issues = issuesOf(input);
    expect(issues).toEqual([
      expect.objectContaining({
        code: 'voltage-mismatch',
        path: 'transformers[0].primaryKv',
        elementId: 'TX-1',
        field: 'primaryKv',
      }),
      expect.objectContaining({
        code: 'voltage-mismatch',
        path: 'transformers[0].secondaryKv',
        elementId: 'TX-1',
        field: 'secondaryKv',
      }),
    ]);
    expect(issues[0].message).toContain('SWGR-A');
  });

  it('a cable or tie joining buses of different voltages', () => {
    const input = example();
    input.buses.push({ id: 'PNL-1', nominalKv: 0.208 });
    input.cables!.push({
      id: 'FDR-8',
      fromBus: 'MCC-2',
      toBus: 'PNL-1',
      lengthM: 10,
      size: '2',
      material: 'Cu',
      conduit: 'pvc',
    });
    input.ties = [{ id: 'TIE-9', fromBus: 'SWBD-1', toBus: 'PNL-1' }];
    expect(issuesOf(input)).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ code: 'voltage-mismatch', path: 'cables[1].toBus', elementId: 'FDR-8' }),
        expect.objectContaining({ code: 'voltage-mismatch', path: 'ties[0].toBus', elementId: 'TIE-9' }),
      ]),
    );
  });

  it('a branch with both ends on one bus', () => {
    const input = example();
    input.cables!.push({
      id: 'LOOP',
      fromBus: 'MCC-2',
      toBus: 'MCC-2',
      lengthM: 10,
      size: '2',
      material: 'Cu',
      conduit: 'pvc',
    });
    expect(issuesOf(input)).toEqual([
      expect.objectContaining({ code: 'self-loop', path: 'cables[1].toBus', elementId: 'LOOP' }),
    ]);
  });

  it('motor and generator ratings far from the bus voltage', () => {
    const input = example();
    input.motors![0] = { ...input.motors![0], kv: 4.0 };
    input.sources!.push({
      id: 'GEN-1',
      kind: 'generator',
      bus: 'SWBD-1',
      kva: 500,
      kv: 0.208,
      subtransientPct: 15,
      xr: 20,
    });
    const paths = issuesOf(input).map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['motors[0].kv', 'sources[1].kv']));
  });

  it('devices must sit on a known branch, or on a known source or motor', () => {
    const input = example();
    input.devices!.push(
      { id: 'CB-X', branch: 'NO-SUCH', end: 'from', device: fuse },
      { id: 'CB-Y', source: 'NO-SOURCE', device: fuse },
      { id: 'CB-M', source: 'P-101', device: fuse },
    );
    expect(issuesOf(input)).toEqual([
      expect.objectContaining({
        code: 'unknown-reference',
        path: 'devices[1].branch',
        elementId: 'CB-X',
        field: 'branch',
      }),
      expect.objectContaining({
        code: 'unknown-reference',
        path: 'devices[2].source',
        elementId: 'CB-Y',
        field: 'source',
      }),
    ]);
  });

  it('14 AWG aluminum has no NEC Chapter 9 Table 9 value', () => {
    // NEC (NFPA 70) Chapter 9 Table 9 lists no 14 AWG aluminum conductor.
    const input = example();
    input.cables![0] = { ...input.cables![0], size: '14', material: 'Al' };
    expect(issuesOf(input)).toEqual([expect.objectContaining({ code: 'missing-table-value', path: 'cables[0].size' })]);
  });

  it('validateModel on a parsed model returns the same issues as parseModel', () => {
    const input = example();
    input.cables![0] = { ...input.cables![0], toBus: 'MCC-9' };
    const model = modelSchema.parse(input);
    expect(validateModel(model)).toEqual(issuesOf(input));
  });
});
