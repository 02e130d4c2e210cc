import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Panel } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { requireUser, useUser } from '@/lib/authorization';
import { getSeriesQueryOptions } from '@/features/series/api/get-series';
import { SeriesStrip } from '@/features/series/components/series-strip';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getSeriesQueryOptions(Number(params.seriesId)));
    return null;
  };

export default function SeriesRoute() {
  const seriesId = Number(useParams().seriesId);
  const { data: user } = useUser();
  const series = useQuery({ ...getSeriesQueryOptions(seriesId), enabled: !!user });
  if (!series.data) return <PageSpinner />;
  return (
    <>
      <PageHeader
        title={series.data.title}
        description="EVAs planned as a series: each starts with the items where the one before left them."
      />
      <Panel title="EVAs and what stays outside between them">
        <SeriesStrip series={series.data} />
      </Panel>
    </>
  );
}
