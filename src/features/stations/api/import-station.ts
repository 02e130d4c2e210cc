import type { ImportStationResult } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { stationKeys } from './keys';

const formWith = (file: File, version?: number) => {
  const form = new FormData();
  form.append('file', file);
  if (version !== undefined) form.append('version', String(version));
  return form;
};

/** A new station from a station document file. */
export function importStation(file: File): Promise<ImportStationResult> {
  return api.post('/stations/import', formWith(file));
}

/** Replaces a station's whole model; `version` is the one the page shows, so a stale replace is refused. */
export function replaceStationModel({
  stationId,
  file,
  version,
}: {
  stationId: number;
  file: File;
  version?: number;
}): Promise<ImportStationResult> {
  return api.put(`/stations/${stationId}/import`, formWith(file, version));
}

export function useImportStation({ onSuccess }: { onSuccess?: (result: ImportStationResult) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: importStation,
    invalidates: [stationKeys.lists()],
    onSuccess,
  });
}

export function useReplaceStationModel({
  onSuccess,
}: { onSuccess?: (result: ImportStationResult) => void } = {}) {
  return useInvalidatingMutation({
    mutationFn: replaceStationModel,
    invalidates: [stationKeys.all],
    onSuccess,
  });
}
