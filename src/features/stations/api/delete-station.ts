import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { stationKeys } from './keys';

/** Deletes a station at the version on screen; one that plans use is refused (409 naming them). */
export function deleteStation({ id, version }: { id: number; version: number }): Promise<void> {
  return api.delete(`/stations/${id}?version=${version}`);
}

export function useDeleteStation({ onSuccess }: { onSuccess?: () => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: deleteStation,
    invalidates: [stationKeys.lists()],
    onSuccess,
  });
}
