import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SetPasswordInput, User } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { setSignedInUser } from '@/lib/authorization';

export function setPassword(input: SetPasswordInput): Promise<{ user: User }> {
  return api.post('/auth/set-password', input);
}

export function useSetPassword({ onSuccess }: { onSuccess?: (user: User) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setPassword,
    onSuccess: ({ user }) => {
      setSignedInUser(queryClient, user);
      onSuccess?.(user);
    },
  });
}
