import { accountLinksApi } from './accountLinks';
import { attentionApi } from './attention';
import { authApi } from './auth';
import { calcApi } from './calc';
import { compareApi } from './compare';
import { devicesApi } from './devices';
import type { Endpoint } from './endpoint';
import { labelBatchesApi } from './labelBatches';
import { labelsApi } from './labels';
import { mailApi } from './mail';
import { mitigationApi } from './mitigation';
import { oneLineApi } from './oneLine';
import { organizationApi } from './organization';
import { sitesApi } from './sites';
import { studiesApi } from './studies';
import { systemApi } from './system';
import { usersApi } from './users';

export * from './endpoint';

/**
 * The API contract: every route by area and name (`contract.sites.create`), with its method, path, access and
 * schemas. The server binds a handler to each (server/routes/), the client calls them through `callApi`
 * (hooks/api.ts), and the OpenAPI document and the access-matrix test are generated from the bound table.
 */
export const contract = {
  system: systemApi,
  auth: authApi,
  accountLinks: accountLinksApi,
  users: usersApi,
  sites: sitesApi,
  organization: organizationApi,
  calc: calcApi,
  devices: devicesApi,
  studies: studiesApi,
  oneLine: oneLineApi,
  compare: compareApi,
  mitigation: mitigationApi,
  labels: labelsApi,
  labelBatches: labelBatchesApi,
  attention: attentionApi,
  mail: mailApi,
};

/** Every endpoint of the contract, as `[area.name, endpoint]`. */
export function contractEntries(): [string, Endpoint][] {
  return Object.entries(contract).flatMap(([area, group]) =>
    Object.entries(group).map(([name, e]) => [`${area}.${name}`, e as Endpoint] as [string, Endpoint]),
  );
}
