import type { AffectedPlan } from '@shared/schemas/plan-views';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { stationKeys } from './keys';

export interface CsvFiles {
  nodes?: File;
  edges?: File;
  arms?: File;
}

export interface CsvImportVariables {
  stationId: number;
  files: CsvFiles;
  /** the version on screen, so a stale import is refused */
  version: number;
}

/** How many nodes and edges a merge adds and changes (upserts by key, edges by ends and kind). */
export interface CsvMergeCounts {
  added: { nodes: number; edges: number };
  updated: { nodes: number; edges: number };
}

export interface CsvImportResult extends CsvMergeCounts {
  station: { id: number; name: string; version: number };
  affectedPlans?: AffectedPlan[];
}

const csvForm = ({ files, version }: CsvImportVariables) => {
  const form = new FormData();
  for (const field of ['nodes', 'edges', 'arms'] as const) {
    const file = files[field];
    if (file) form.append(field, file);
  }
  form.append('version', String(version));
  return form;
};

/** Merges the CSV files into the station's model, all or nothing. */
export function importStationCsv(variables: CsvImportVariables): Promise<CsvImportResult> {
  return api.post(`/stations/${variables.stationId}/import-csv`, csvForm(variables));
}

/** The files checked against the model, nothing written: every problem at once (a 400), or the reviewed plans it touches. */
export function previewStationCsv(
  variables: CsvImportVariables,
): Promise<{ dryRun: true; version: number; affectedPlans: AffectedPlan[] } & CsvMergeCounts> {
  return api.post(`/stations/${variables.stationId}/import-csv?dryRun=1`, csvForm(variables));
}

export function useImportStationCsv() {
  return useInvalidatingMutation({ mutationFn: importStationCsv, invalidates: [stationKeys.all] });
}
