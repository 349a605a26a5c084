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
  studies: {
    all: () => ['studies'] as const,
    bySite: (siteId: string) => ['studies', 'site', siteId] as const,
    detail: (id: string) => ['studies', 'detail', id] as const,
    model: (id: string) => ['studies', 'model', id] as const,
    run: (id: string) => ['studies', 'run', id] as const,
    results: (id: string) => ['studies', 'results', id] as const,
  },
  equipment: (siteId: string) => ['equipment', siteId] as const,
  sites: {
    all: () => ['sites'] as const,
    list: () => ['sites', 'list'] as const,
    detail: (siteId: string) => ['sites', 'detail', siteId] as const,
  },
};
