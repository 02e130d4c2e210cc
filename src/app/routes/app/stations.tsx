import { useState } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/app-layout';
import { Button } from '@/components/ui/button';
import { EmptyState, Panel } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { PageSpinner } from '@/components/ui/spinner';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { useCan } from '@/lib/authorization';
import { getStationsQueryOptions, useStations } from '@/features/stations/api/get-stations';
import { ImportStationForm } from '@/features/stations/components/import-station-form';
import { StationsTable } from '@/features/stations/components/stations-table';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getStationsQueryOptions());
  return null;
};

export default function StationsRoute() {
  const stations = useStations();
  const canImport = useCan('stations:import');
  const [importing, setImporting] = useState(false);
  const [imported, setImported] = useState<{ id: number; name: string } | null>(null);

  return (
    <>
      <PageHeader
        title="Stations"
        description="Exterior models: handrails, anchors, foot-restraint sockets, worksites, hazards and the truss they sit on."
        actions={
          canImport && (
            <Button
              onClick={() => {
                setImported(null);
                setImporting(true);
              }}
            >
              Import a station
            </Button>
          )
        }
      />
      <Panel>
        {!stations.data ? (
          <PageSpinner />
        ) : stations.data.length === 0 ? (
          <EmptyState>No stations yet.{canImport && ' Import a station document to begin.'}</EmptyState>
        ) : (
          <StationsTable stations={stations.data} />
        )}
      </Panel>
      <Dialog open={importing} title="Import a station" onClose={() => setImporting(false)}>
        <ImportStationForm
          target={{ mode: 'new' }}
          stationNames={stations.data?.map((s) => s.name) ?? []}
          onSuccess={({ station }) => setImported(station)}
        />
        {imported && (
          <p className="mt-3 text-sm">
            <TextLink to={paths.station.getHref(imported.id)}>Open {imported.name}</TextLink>
          </p>
        )}
      </Dialog>
    </>
  );
}
