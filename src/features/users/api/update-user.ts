import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserInput, UserAdminView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export function updateUser({
  id,
  data,
}: {
  id: number;
  data: UpdateUserInput;
}): Promise<{ user: UserAdminView }> {
  return api.patch(`/users/${id}`, data);
}

export function useUpdateUser({ onSuccess }: { onSuccess?: (user: UserAdminView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: ({ user }) => {
      void queryClient.invalidateQueries({ queryKey: userKeys.lists() });
      onSuccess?.(user);
    },
  });
}
