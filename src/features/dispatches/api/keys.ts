export const dispatchKeys = {
  all: ['dispatches'] as const,
  list: () => [...dispatchKeys.all, 'list'] as const,
  one: (id: string) => [...dispatchKeys.all, 'one', id] as const,
  progress: (id: string) => [...dispatchKeys.all, 'progress', id] as const,
  feed: () => [...dispatchKeys.all, 'feed'] as const,
  page: (slug: string) => [...dispatchKeys.all, 'page', slug] as const,
};
