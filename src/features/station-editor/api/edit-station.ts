import type { Arm, StationNode, StationEdge, Hazard } from '@shared/schemas/station';
import type {
  EdgeChangesSchema,
  HazardChangesSchema,
  NodeChangesSchema,
  UpdateStationInput,
} from '@shared/schemas/station-edits';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import type { z } from 'zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { stationEditorKeys } from './keys';

/** One change to the station model, as the editor builds it; the version is added when it is sent. */
export type StationEdit =
  | { type: 'create-node'; node: StationNode }
  | { type: 'update-node'; key: string; node: z.infer<typeof NodeChangesSchema> }
  | { type: 'delete-node'; key: string }
  | { type: 'create-edge'; edge: StationEdge }
  | { type: 'update-edge'; edgeId: number; name: string; edge: z.infer<typeof EdgeChangesSchema> }
  | { type: 'delete-edge'; edgeId: number; name: string }
  | { type: 'create-hazard'; hazard: Hazard }
  | { type: 'update-hazard'; key: string; hazard: z.infer<typeof HazardChangesSchema> }
  | { type: 'delete-hazard'; key: string }
  | { type: 'update-station'; changes: Omit<UpdateStationInput, 'version'> }
  /** the arms as a whole list (the API replaces it); `what` says the change in words */
  | { type: 'set-arms'; arms: Arm[]; what: string };

export interface StationEditVariables {
  /** the station version the edit was made against */
  version: number;
  edit: StationEdit;
}

export interface StationEditResult {
  version: number;
  /** the plans in review or approved the edit touched (listed on them, their authors mailed) */
  affectedPlans?: AffectedPlan[];
}

/** A dry run's answer: the plans the edit would touch; nothing was written. */
export interface StationEditPreview {
  dryRun: true;
  version: number;
  affectedPlans: AffectedPlan[];
}

export function editStation(
  stationId: number,
  { version, edit }: StationEditVariables,
  options: { dryRun?: boolean } = {},
): Promise<StationEditResult> {
  const base = `/stations/${stationId}`;
  const dry = options.dryRun ? 'dryRun=1' : '';
  const q = `?version=${version}${dry ? `&${dry}` : ''}`;
  const d = dry ? `?${dry}` : '';
  switch (edit.type) {
    case 'create-node':
      return api.post(`${base}/nodes${d}`, { version, node: edit.node });
    case 'update-node':
      return api.patch(`${base}/nodes/${encodeURIComponent(edit.key)}${d}`, { version, node: edit.node });
    case 'delete-node':
      return api.delete(`${base}/nodes/${encodeURIComponent(edit.key)}${q}`);
    case 'create-edge':
      return api.post(`${base}/edges${d}`, { version, edge: edit.edge });
    case 'update-edge':
      return api.patch(`${base}/edges/${edit.edgeId}${d}`, { version, edge: edit.edge });
    case 'delete-edge':
      return api.delete(`${base}/edges/${edit.edgeId}${q}`);
    case 'create-hazard':
      return api.post(`${base}/hazards${d}`, { version, hazard: edit.hazard });
    case 'update-hazard':
      return api.patch(`${base}/hazards/${encodeURIComponent(edit.key)}${d}`, {
        version,
        hazard: edit.hazard,
      });
    case 'delete-hazard':
      return api.delete(`${base}/hazards/${encodeURIComponent(edit.key)}${q}`);
    case 'update-station':
      return api.patch(`${base}${d}`, { version, ...edit.changes });
    case 'set-arms':
      return api.patch(`${base}${d}`, { version, arms: edit.arms });
  }
}

/** Which plans in review or approved an edit would touch, asked before it is made (nothing is written). */
export function previewStationEdit(stationId: number, variables: StationEditVariables) {
  return editStation(stationId, variables, { dryRun: true }) as unknown as Promise<StationEditPreview>;
}

/** What the edit does, in a few words, for messages ("Your change … was not saved"). */
export function describeStationEdit(edit: StationEdit): string {
  switch (edit.type) {
    case 'create-node':
      return `add node ${edit.node.key}`;
    case 'update-node':
      return `change node ${edit.key}`;
    case 'delete-node':
      return `delete node ${edit.key}`;
    case 'create-edge':
      return `connect ${edit.edge.from} to ${edit.edge.to}`;
    case 'update-edge':
      return `change edge ${edit.name}`;
    case 'delete-edge':
      return `disconnect ${edit.name}`;
    case 'create-hazard':
      return `add hazard ${edit.hazard.key}`;
    case 'update-hazard':
      return `change hazard ${edit.key}`;
    case 'delete-hazard':
      return `delete hazard ${edit.key}`;
    case 'update-station':
      return 'change station settings';
    case 'set-arms':
      return edit.what;
  }
}

interface UseEditStationOptions {
  stationId: number;
  /** the route refetches the station graph through the stations feature's keys */
  onChanged?: () => void;
  onSuccess?: (result: StationEditResult, variables: StationEditVariables) => void;
}

export function useEditStation({ stationId, onChanged, onSuccess }: UseEditStationOptions) {
  const queryClient = useQueryClient();
  const invalidateAudit = () =>
    queryClient.invalidateQueries({ queryKey: stationEditorKeys.audit(stationId) });
  return useMutation({
    mutationFn: (variables: StationEditVariables) => editStation(stationId, variables),
    onSuccess: (result, variables) => {
      void invalidateAudit();
      onChanged?.();
      onSuccess?.(result, variables);
    },
    // the audit names who made the change this one collided with
    onError: (error) => {
      if (isApiError(error) && error.status === 409) void invalidateAudit();
    },
  });
}
