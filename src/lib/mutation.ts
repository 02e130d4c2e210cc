import { useMutation, useQueryClient, type QueryKey } from '@tanstack/react-query';

interface InvalidatingMutationOptions<TData, TVariables> {
  mutationFn: (variables: TVariables) => Promise<TData>;
  /** keys from the feature's key factory that the write makes stale */
  invalidates: readonly QueryKey[];
  onSuccess?: (data: TData, variables: TVariables) => void;
}

export function useInvalidatingMutation<TData, TVariables = void>({
  mutationFn,
  invalidates,
  onSuccess,
}: InvalidatingMutationOptions<TData, TVariables>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (data, variables) => {
      for (const queryKey of invalidates) void queryClient.invalidateQueries({ queryKey });
      onSuccess?.(data, variables);
    },
  });
}
