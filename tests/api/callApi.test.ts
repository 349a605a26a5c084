/**
 * The web client's typed caller (`callApi` in hooks/api.ts) against the real server: it fills the path from the
 * contract's parameters, sends the query and body, and parses the answer with the endpoint's response schema, so the
 * client and the server read the same contract (shared/api).
 */
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { contract, type Endpoint } from '../../shared/api';
import { makeTestApp, type TestApp } from '../helpers/testApp';

/*
 * hooks/ is compiled for the browser (DOM types), which the server's tsconfig does not have: the client modules are
 * loaded untyped here, and their types are checked by `tsc -p tsconfig.json`.
 */
type Answer = Record<string, unknown> & { id: string; name: string };
interface ClientApi {
  callApi(
    endpoint: Endpoint,
    args?: { params?: Record<string, string>; query?: Record<string, unknown>; body?: unknown; formData?: FormData },
  ): Promise<Answer | undefined>;
  ApiClientError: new (...args: never[]) => Error & { status: number; code: string };
  TOKEN_KEY: string;
}
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { callApi, ApiClientError, TOKEN_KEY } = require('../../hooks/api') as ClientApi;
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { storage } = require('../../hooks/storage') as {
  storage: { set(k: string, v: string): void; remove(k: string): void };
};
const call = async (endpoint: Endpoint, args?: Parameters<ClientApi['callApi']>[1]) =>
  (await callApi(endpoint, args)) as Answer;

let t: TestApp;
let server: Server;
const savedBase = process.env.EXPO_PUBLIC_API_URL;

beforeAll(async () => {
  t = await makeTestApp();
  server = t.app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  process.env.EXPO_PUBLIC_API_URL = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  process.env.EXPO_PUBLIC_API_URL = savedBase;
  storage.remove(TOKEN_KEY);
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await t.close();
});

const signInAs = (token: string) => storage.set(TOKEN_KEY, token);

describe('callApi', () => {
  it('creates, reads and edits a site through the contract', async () => {
    signInAs(t.orgA.users.engineer.token);
    const created = await call(contract.sites.create, { body: { name: 'Caller site / north' } });
    expect(created.name).toBe('Caller site / north');
    const read = await call(contract.sites.get, { params: { siteId: created.id } });
    expect(read.id).toBe(created.id);
    const edited = await call(contract.sites.update, {
      params: { siteId: created.id },
      body: { name: 'Caller site / south' },
    });
    expect(edited.name).toBe('Caller site / south');
    const { sites } = (await call(contract.sites.list)) as unknown as { sites: Answer[] };
    expect(sites.map((s) => s.id)).toContain(created.id);
  });

  it('sends the query of an endpoint', async () => {
    signInAs(t.orgA.users.engineer.token);
    const site = await call(contract.sites.create, { body: { name: 'Query site' } });
    const answer = await call(contract.labels.siteLabels, { params: { siteId: site.id }, query: { current: '1' } });
    expect(answer).toEqual({ labels: [] });
    // A query value the schema refuses reaches the server and comes back as a 400 naming the field.
    const bad = await call(contract.labels.siteLabels, { params: { siteId: site.id }, query: { current: '2' } }).catch(
      (e: unknown) => e,
    );
    expect(bad).toMatchObject({ status: 400, code: 'bad_request' });
    expect((bad as { fields?: Record<string, string> }).fields).toHaveProperty('current');
  });

  it('answers 204 routes with nothing', async () => {
    signInAs(t.orgA.users.engineer.token);
    const created = await call(contract.devices.create, {
      body: {
        name: 'Caller fuse',
        definition: {
          kind: 'fuse',
          ratingA: 100,
          totalClearing: [
            [200, 10],
            [400, 1],
            [1000, 0.05],
          ],
        },
      },
    });
    await expect(callApi(contract.devices.remove, { params: { deviceTypeId: created.id } })).resolves.toBeUndefined();
  });

  it('sends a multipart upload with its query', async () => {
    signInAs(t.orgA.users.engineer.token);
    const form = new FormData();
    form.append('file', new Blob(['multiple,min_s,max_s\n2,50,100\n5,5,12\n'], { type: 'text/csv' }), 'band.csv');
    const read = await call(contract.devices.parseBandCsv, { query: { currentUnit: 'multiple' }, formData: form });
    expect(read).toMatchObject({
      currentUnit: 'multiple',
      max: [
        [2, 100],
        [5, 12],
      ],
    });
  });

  it('turns an error answer into an ApiClientError with its code and fields', async () => {
    signInAs(t.orgA.users.electrician.token);
    const err = await call(contract.sites.create, { body: { name: 'Not allowed' } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiClientError);
    expect(err).toMatchObject({ status: 403, code: 'forbidden' });
    signInAs(t.orgA.users.engineer.token);
    const bad = await call(contract.sites.get, { params: { siteId: 'no-such-site' } }).catch((e: unknown) => e);
    expect(bad).toMatchObject({ status: 404, code: 'not_found' });
  });
});
