/** react-query keys from one factory; mutations invalidate through these. */
export const queryKeys = {
  me: () => ['me'] as const,
  users: () => ['users'] as const,
  sites: {
    all: () => ['sites'] as const,
    list: () => ['sites', 'list'] as const,
    detail: (siteId: string) => ['sites', 'detail', siteId] as const,
  },
};
