import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationAuditEntry } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { stationEditorKeys } from './keys';

interface AuditPage {
  items: StationAuditEntry[];
  total: number;
  page: number;
  pageSize: number;
}

/** The newest edits first. */
export async function getStationAudit(stationId: number): Promise<StationAuditEntry[]> {
  const body = await api.get<AuditPage>(`/stations/${stationId}/audit?pageSize=30`);
  return body.items;
}

export const getStationAuditQueryOptions = (stationId: number) =>
  queryOptions({ queryKey: stationEditorKeys.audit(stationId), queryFn: () => getStationAudit(stationId) });

export function useStationAudit(stationId: number) {
  return useQuery(getStationAuditQueryOptions(stationId));
}
