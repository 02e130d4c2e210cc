import type { AffectedPlan } from '@shared/schemas/plan-views';
import type { ImportStationPreview, ImportStationResult } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { stationKeys } from './keys';

const formWith = (file: File, fields: Record<string, string | number | undefined> = {}) => {
  const form = new FormData();
  form.append('file', file);
  for (const [k, v] of Object.entries(fields)) if (v !== undefined) form.append(k, String(v));
  return form;
};

/** A new station from a station document file, named `name` when given (else the document's name). */
export function importStation({ file, name }: { file: File; name?: string }): Promise<ImportStationResult> {
  return api.post('/stations/import', formWith(file, { name }));
}

/** The document read and checked, nothing written: its name, counts and the stations already so named. */
export function previewStationImport({ file }: { file: File }): Promise<ImportStationPreview> {
  return api.post('/stations/import?dryRun=1', formWith(file));
}

export interface ReplaceVariables {
  stationId: number;
  file: File;
  /** the version on screen, so a stale replace is refused */
  version?: number;
}

/** Replaces a station's whole model; `version` is the one the page shows, so a stale replace is refused. */
export function replaceStationModel({
  stationId,
  file,
  version,
}: ReplaceVariables): Promise<ImportStationResult & { affectedPlans?: AffectedPlan[] }> {
  return api.put(`/stations/${stationId}/import`, formWith(file, { version }));
}

/** What a replace would do: the reviewed plans it would touch; nothing is written. */
export function previewStationReplace({
  stationId,
  file,
  version,
}: ReplaceVariables): Promise<{ dryRun: true; version: number; affectedPlans: AffectedPlan[] }> {
  return api.put(`/stations/${stationId}/import?dryRun=1`, formWith(file, { version }));
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
