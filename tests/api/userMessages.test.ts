/**
 * What a user reads when a value is wrong is a sentence about their data, never the schema library's wording
 * ("Too small: expected number to be >0", "Invalid input: expected number, received NaN") nor a program's code.
 * The wording is shared (shared/zodMessages.ts), so the model issues, the import errors and the server's field
 * errors say the same thing. Wording rules here are the product's own (common practice, no source).
 */
import request from 'supertest';
import { parseModel } from '../../shared/schemas/model';
import { incidentEnergyRequestSchema } from '../../shared/schemas/incidentEnergy';
import { fieldWords } from '../../shared/zodMessages';
import { importModelJson } from '../../server/io/modelJson';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

/** Library wording and code-like tokens that must not reach a user. */
const DEVELOPER_WORDING =
  /expected|received|[<>]=?\s*\d|Invalid input|Too (small|big)|NaN|[a-z]+-[a-z]+-[a-z]+:|[A-Z]+_[A-Z_]+|undefined/;

function expectSentence(message: string) {
  expect(message).not.toMatch(DEVELOPER_WORDING);
  expect(message).toMatch(/^[A-Z]/);
}

describe('model issues (parseModel) and JSON import', () => {
  it('words a negative length, a NaN and a missing number as sentences naming the number wanted', () => {
    const model = smallModel() as unknown as {
      cables: Record<string, unknown>[];
      transformers: Record<string, unknown>[];
      buses: Record<string, unknown>[];
    };
    model.cables[0]!.lengthM = -3;
    model.transformers[0]!.impedancePct = Number.NaN;
    delete model.transformers[0]!.kva;
    model.buses[2]!.equipment = { class: 'mcc-panelboard-lv-deep', gapMm: 0 };
    const r = parseModel(model);
    expect(r.success).toBe(false);
    const byPath = new Map(r.issues.map((i) => [i.path, i.message]));
    for (const m of byPath.values()) expectSentence(m);
    expect(byPath.get('cables[0].lengthM')).toMatch(/Enter a number greater than 0$/i);
    expect(byPath.get('transformers[0].impedancePct')).toMatch(/Enter a number$/i);
    expect(byPath.get('transformers[0].kva')).toMatch(/required/i);
    expect(byPath.get('buses[2].equipment.gapMm')).toMatch(/greater than 0/);
  });

  it('an unknown equipment class and a wrong kind of value in an imported file read as sentences', () => {
    const model = smallModel() as unknown as { buses: Record<string, unknown>[]; cables: Record<string, unknown>[] };
    model.buses[1]!.equipment = { class: 'no-such-class' };
    model.cables[0]!.sets = 'two';
    const file = importModelJson(JSON.stringify(model));
    expect(file.ok).toBe(true); // the file reads; the model checks follow
    if (!file.ok) return;
    const r = parseModel(file.input);
    expect(r.success).toBe(false);
    const messages = r.issues.map((i) => file.locate(i).message);
    expect(messages.length).toBeGreaterThanOrEqual(2);
    for (const m of messages) expectSentence(m);
  });
});

describe('the spot check request (a form)', () => {
  it('gives each bad field a sentence (the request’s own messages)', () => {
    const r = incidentEnergyRequestSchema.safeParse({
      voltageV: 480,
      boltedFaultKa: -2,
      electrodeConfig: 'VCB',
      gapMm: Number.NaN,
      workingDistanceMm: 0,
      arcDurationMs: 50,
    });
    expect(r.success).toBe(false);
    const byField = new Map(r.error!.issues.map((i) => [i.path.join('.'), i.message]));
    for (const m of byField.values()) expectSentence(m);
    expect(byField.get('boltedFaultKa')).toBe('Enter a number greater than zero');
    expect(byField.get('gapMm')).toBe('Enter a number');
    expect(byField.get('workingDistanceMm')).toBe('Enter a number greater than zero');
  });

  it('a check without its own message gets the field’s words from its description', () => {
    const model = smallModel() as unknown as { buses: Record<string, unknown>[] };
    model.buses[2]!.equipment = {
      class: 'mcc-panelboard-lv-deep',
      enclosureMm: { height: 500, width: -1, depth: 500 },
    };
    const r = parseModel(model);
    expect(r.success).toBe(false);
    expect(r.issues.find((i) => i.path === 'buses[2].equipment.enclosureMm.width')?.message).toBe(
      'Enclosure width: enter a number greater than 0',
    );
  });

  it('the field words are the description’s first words, or none', () => {
    expect(fieldWords('Enclosure height, mm')).toBe('Enclosure height');
    expect(fieldWords('Omitted: the typical value of the class')).toBeUndefined();
    expect(fieldWords(undefined)).toBeUndefined();
  });
});

describe('the server’s field errors', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp();
  });
  afterAll(async () => t.close());

  it('POST /api/calc/incident-energy answers a 400 whose field messages are sentences', async () => {
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.electrician.token))
      .send({
        voltageV: 480,
        boltedFaultKa: 0,
        electrodeConfig: 'VXX',
        gapMm: 25,
        workingDistanceMm: 'far',
        arcDurationMs: 50,
      });
    expect(res.status).toBe(400);
    const fields = res.body.error.fields as Record<string, string>;
    expect(Object.keys(fields).sort()).toEqual(['boltedFaultKa', 'electrodeConfig', 'workingDistanceMm']);
    for (const m of Object.values(fields)) expectSentence(m);
    expect(fields.electrodeConfig).toMatch(/electrode configuration: choose one of: VCB, VCBB, HCB, VOA, HOA$/);
  });
});
