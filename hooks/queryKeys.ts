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
  sites: {
    all: () => ['sites'] as const,
    list: () => ['sites', 'list'] as const,
    detail: (siteId: string) => ['sites', 'detail', siteId] as const,
  },
};
