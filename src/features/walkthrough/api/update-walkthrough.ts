import { useQueryClient } from '@tanstack/react-query';
import type { UpdateWalkthroughInput, WalkthroughDetail } from '@shared/schemas/walkthrough';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { walkthroughKeys } from './keys';

export function updateWalkthrough({
  id,
  data,
}: {
  id: number;
  data: UpdateWalkthroughInput;
}): Promise<WalkthroughDetail> {
  return api.patch(`/walkthroughs/${id}`, data);
}

export function useUpdateWalkthrough({
  onSuccess,
}: { onSuccess?: (detail: WalkthroughDetail) => void } = {}) {
  const queryClient = useQueryClient();
  return useInvalidatingMutation({
    mutationFn: updateWalkthrough,
    invalidates: [walkthroughKeys.lists()],
    onSuccess: (detail) => {
      // the answer is the new detail: no second round trip for the page that saved it
      queryClient.setQueryData(walkthroughKeys.detail(detail.walkthrough.id), detail);
      onSuccess?.(detail);
    },
  });
}
