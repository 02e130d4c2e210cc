import type { StationDocument } from '@shared/schemas/station';
import { api } from '@/lib/api-client';

export function exportStation(id: number): Promise<StationDocument> {
  return api.get(`/stations/${id}/export`);
}

export const exportFileName = (name: string) =>
  `${
    name
      .trim()
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '') || 'station'
  }.station.json`;

/** Saves the station document as a JSON file the browser downloads. */
export async function downloadStationExport(id: number): Promise<string> {
  const doc = await exportStation(id);
  const blob = new Blob([JSON.stringify(doc, null, 2)], { type: 'application/json' });
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = exportFileName(doc.name);
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
  return link.download;
}
