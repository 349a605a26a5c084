/** react-query keys from one factory; mutations invalidate through these. */
export const queryKeys = {
  me: () => ['me'] as const,
  users: () => ['users'] as const,
  organization: () => ['organization'] as const,
  deviceTypes: {
    all: () => ['device-types'] as const,
    list: () => ['device-types', 'list'] as const,
    detail: (id: string) => ['device-types', 'detail', id] as const,
  },
  bandCurves: (deviceJson: string) => ['band-curves', deviceJson] as const,
  resolvedTripUnit: (definitionJson: string) => ['resolve-trip-unit', definitionJson] as const,
  studies: {
    all: () => ['studies'] as const,
    bySite: (siteId: string) => ['studies', 'site', siteId] as const,
    detail: (id: string) => ['studies', 'detail', id] as const,
    model: (id: string) => ['studies', 'model', id] as const,
    run: (id: string) => ['studies', 'run', id] as const,
    results: (id: string) => ['studies', 'results', id] as const,
    /** Under `results(id)`, so invalidating the results drops every page and bus too. */
    resultsPage: (id: string, params: Record<string, unknown>) => ['studies', 'results', id, 'page', params] as const,
    /** `scenario` undefined: the governing scenario (the stored trace). */
    busResult: (id: string, busId: string, scenario?: string) =>
      ['studies', 'results', id, 'bus', busId, scenario ?? null] as const,
    /** Under `results(id)`: a new run of the study drops its comparisons too. */
    compare: (id: string, otherId: string) => ['studies', 'results', id, 'compare', otherId] as const,
  },
  labels: {
    all: () => ['labels'] as const,
    detail: (code: string) => ['labels', 'detail', code] as const,
    check: (code: string) => ['labels', 'check', code] as const,
    site: (siteId: string) => ['labels', 'site', siteId] as const,
  },
  labelBatch: (id: string | null) => ['label-batches', id ?? ''] as const,
  equipment: (siteId: string) => ['equipment', siteId] as const,
  sites: {
    all: () => ['sites'] as const,
    list: () => ['sites', 'list'] as const,
    detail: (siteId: string) => ['sites', 'detail', siteId] as const,
  },
  attention: {
    all: () => ['attention'] as const,
    summary: (siteId: string | null) => ['attention', 'summary', siteId ?? ''] as const,
    list: (list: string, siteId: string | null) => ['attention', 'list', list, siteId ?? ''] as const,
  },
  fieldReports: {
    all: () => ['field-reports'] as const,
    list: (filters: { status?: string; siteId?: string; mine?: boolean }) =>
      ['field-reports', 'list', filters] as const,
    detail: (id: string) => ['field-reports', 'detail', id] as const,
  },
  audit: {
    all: () => ['audit-events'] as const,
    list: (filters: Record<string, string | undefined>) => ['audit-events', 'list', filters] as const,
  },
  reminders: {
    all: () => ['reminders'] as const,
    rules: () => ['reminders', 'rules'] as const,
    deliveries: () => ['reminders', 'deliveries'] as const,
  },
  outbox: () => ['outbox'] as const,
  invitations: () => ['invitations'] as const,
  linkInfo: (token: string) => ['link-info', token] as const,
};
