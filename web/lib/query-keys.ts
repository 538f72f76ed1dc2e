/**
 * Query keys shared by several features. Keys go from general to specific: invalidating ['projects'] refreshes every
 * project query, including a project's members, invitations and history.
 */
export const projectKeys = {
  all: ['projects'] as const,
  list: () => [...projectKeys.all, 'list'] as const,
  one: (id: string) => [...projectKeys.all, id] as const,
  members: (id: string) => [...projectKeys.all, id, 'members'] as const,
  invitations: (id: string) => [...projectKeys.all, id, 'invitations'] as const,
  history: (id: string) => [...projectKeys.all, id, 'history'] as const,
};
