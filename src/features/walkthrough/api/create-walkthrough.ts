import type { CreateWalkthroughInput, WalkthroughDetail } from '@shared/schemas/walkthrough';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { walkthroughKeys } from './keys';

export function createWalkthrough(input: CreateWalkthroughInput): Promise<WalkthroughDetail> {
  return api.post('/walkthroughs', input);
}

export function useCreateWalkthrough({
  onSuccess,
}: { onSuccess?: (detail: WalkthroughDetail) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: createWalkthrough,
    invalidates: [walkthroughKeys.lists()],
    onSuccess: (detail) => onSuccess?.(detail),
  });
}
