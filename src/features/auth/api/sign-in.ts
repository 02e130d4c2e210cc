import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SignInInput, User } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { setSignedInUser } from '@/lib/authorization';

export function signIn(input: SignInInput): Promise<{ user: User }> {
  return api.post('/auth/sign-in', input);
}

export function useSignIn({ onSuccess }: { onSuccess?: (user: User) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: ({ user }) => {
      setSignedInUser(queryClient, user);
      onSuccess?.(user);
    },
  });
}
