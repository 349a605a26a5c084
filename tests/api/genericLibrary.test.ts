import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { markEarlierGenericTypes } from '../../server/db/migrations/010-generic-library';
import { DeviceType, Organization } from '../../server/db/models';
import {
  GENERIC_LIBRARY,
  addMissingGenericTypes,
  addMissingGenericTypesEverywhere,
} from '../../server/services/deviceTypes';
import { EXAMPLE_THERMAL_MAGNETIC } from '../../server/engine/trip/exampleDevices';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

/**
 * The generic starter set of the device library: added once to every organization, each type with its note, and
 * never touching a type the organization created, edited or removed (common practice, no source: seeding is
 * idempotent).
 */

const NOTE = "generic — verify against the manufacturer's published curve";

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

type Listed = { id: string; name: string; genericNote: string | null; definition: unknown; updatedAt: string };
const list = async (token: string): Promise<Listed[]> => {
  const res = await request(t.app)
    .get('/api/device-types')
    .set(...bearer(token));
  expect(res.status).toBe(200);
  return res.body.deviceTypes as Listed[];
};

describe('an organization given the starter set', () => {
  const eng = () => t.orgA.users.engineer.token;

  it('gets every entry once, each with the note', async () => {
    expect(await addMissingGenericTypes(t.orgA.id)).toBe(GENERIC_LIBRARY.length);
    const types = await list(eng());
    expect(types).toHaveLength(GENERIC_LIBRARY.length);
    for (const ty of types) expect(ty.genericNote).toBe(NOTE);
    expect(types.map((ty) => ty.name).sort()).toEqual(GENERIC_LIBRARY.map((e) => e.name).sort());
  });

  it('reseeding adds nothing and touches nothing: its own types, edited and removed generic types stay as they are', async () => {
    const before = await list(eng());
    // Its own type: no note.
    const own = await request(t.app)
      .post('/api/device-types')
      .set(...bearer(eng()))
      .send({ name: 'Our 20 A breaker, read off the published curve', definition: EXAMPLE_THERMAL_MAGNETIC });
    expect(own.status).toBe(201);
    expect(own.body.genericNote).toBeNull();
    // A generic type renamed only keeps the note; one whose curve is changed becomes the organization's own.
    const renamed = before.find((ty) => ty.name === 'Generic 30 A molded-case breaker')!;
    const renamedRes = await request(t.app)
      .put(`/api/device-types/${renamed.id}`)
      .set(...bearer(eng()))
      .send({ name: 'Feeder 3 breaker (generic 30 A)', definition: renamed.definition });
    expect(renamedRes.status).toBe(200);
    expect(renamedRes.body.genericNote).toBe(NOTE);
    const edited = before.find((ty) => ty.name === 'Generic 100 A molded-case breaker')!;
    const editedDefinition = { ...(edited.definition as object), instantaneousClearingCycles: 1 };
    const editedRes = await request(t.app)
      .put(`/api/device-types/${edited.id}`)
      .set(...bearer(eng()))
      .send({ name: edited.name, definition: editedDefinition });
    expect(editedRes.status).toBe(200);
    expect(editedRes.body.genericNote).toBeNull();
    const removed = before.find((ty) => ty.name === 'Generic 400 A current-limiting fuse')!;
    expect(
      (
        await request(t.app)
          .delete(`/api/device-types/${removed.id}`)
          .set(...bearer(eng()))
      ).status,
    ).toBe(204);
    const afterEdits = await list(eng());

    expect(await addMissingGenericTypes(t.orgA.id)).toBe(0);
    expect(await addMissingGenericTypesEverywhere(t.ctx)).toBe(GENERIC_LIBRARY.length); // orgB had none yet
    expect(await addMissingGenericTypesEverywhere(t.ctx)).toBe(0);
    const after = await list(eng());
    expect(after).toEqual(afterEdits);
    expect(after).toHaveLength(GENERIC_LIBRARY.length + 1 - 1);
    expect(after.filter((ty) => ty.name === 'Generic 400 A current-limiting fuse')).toHaveLength(0);
    expect(after.find((ty) => ty.id === edited.id)!.definition).toEqual(editedDefinition);
  });
});

describe('an organization created before the starter set grew (migration 010)', () => {
  it('keeps its six earlier types, marks the unedited ones generic, and gets the rest', async () => {
    // A fresh organization given only the six earlier types, one of them edited since.
    const org = await Organization.create({ id: randomUUID(), name: 'Older organization' });
    const created = new Date('2025-01-01T00:00:00Z');
    const earlier = [
      'Generic 20 A molded-case breaker',
      'Generic 200 A current-limiting fuse',
      'Feeder relay, very inverse',
      'Incomer relay, standard inverse',
      'Digitized band, multiples of rating',
      'Generic LSIG trip unit, 1600 A frame',
    ];
    const entry = (name: string) => GENERIC_LIBRARY.find((e) => e.name === name)!;
    for (const name of earlier) {
      await DeviceType.create(
        {
          id: randomUUID(),
          organizationId: org.id,
          name,
          kind: entry(name).definition.kind,
          description: 'earlier',
          source: 'Invented example',
          definition: JSON.stringify(entry(name).definition),
          createdAt: created,
          updatedAt: name === 'Incomer relay, standard inverse' ? new Date('2025-06-01T00:00:00Z') : created,
        },
        { silent: true },
      );
    }
    await markEarlierGenericTypes(t.ctx.db.sequelize.getQueryInterface());
    await markEarlierGenericTypes(t.ctx.db.sequelize.getQueryInterface()); // idempotent
    expect(await addMissingGenericTypes(org.id)).toBe(GENERIC_LIBRARY.length - earlier.length);
    const rows = await DeviceType.findAll({ where: { organizationId: org.id } });
    expect(rows).toHaveLength(GENERIC_LIBRARY.length);
    for (const name of earlier) {
      const same = rows.filter((r) => r.name === name);
      expect(same).toHaveLength(1);
      expect(same[0].description).toBe('earlier'); // not touched
      expect(same[0].genericKey).toBe(name === 'Incomer relay, standard inverse' ? null : entry(name).key);
    }
  });
});
