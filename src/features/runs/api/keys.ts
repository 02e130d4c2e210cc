export const runKeys = {
  all: ['runs'] as const,
  ofPlan: (planId: number) => [...runKeys.all, 'plan', planId] as const,
  details: () => [...runKeys.all, 'detail'] as const,
  detail: (id: number) => [...runKeys.details(), id] as const,
};
