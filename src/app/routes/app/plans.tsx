import { useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useNavigate, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { requireUser, useCan, useUser } from '@/lib/authorization';
import { getPlansQueryOptions } from '@/features/plans/api/get-plans';
import { CreatePlanForm } from '@/features/plans/components/create-plan-form';
import { PlansList } from '@/features/plans/components/plans-list';
import { getStationsQueryOptions } from '@/features/stations/api/get-stations';
import { getSeriesListQueryOptions } from '@/features/series/api/get-series';
import { SeriesList } from '@/features/series/components/series-list';
import { CreateSeriesForm } from '@/features/series/components/create-series-form';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getPlansQueryOptions());
    return null;
  };

export default function PlansRoute() {
  const { data: user } = useUser();
  // signing out clears the cache while this page is still mounted: nothing is fetched without a user
  const plans = useQuery({ ...getPlansQueryOptions(), enabled: !!user });
  const stations = useQuery({ ...getStationsQueryOptions(), enabled: !!user });
  const series = useQuery({ ...getSeriesListQueryOptions(), enabled: !!user });
  const canEdit = useCan('plans:edit');
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);
  const [creatingSeries, setCreatingSeries] = useState(false);
  const inSeries = new Set((series.data ?? []).flatMap((s) => s.planIds));
  const choices = (stations.data ?? []).map((s) => ({
    id: s.id,
    name: s.name,
    tetherLengthM: s.settings.tetherLengthM,
    orbit: s.orbit,
  }));

  return (
    <>
      <PageHeader
        title="Plans"
        description="EVA plans by status: drafts being sequenced, plans in review and approved plans."
        actions={
          canEdit && (
            <Button onClick={() => setCreating(true)} disabled={!stations.data?.length}>
              New plan
            </Button>
          )
        }
      />
      <Panel>{plans.data ? <PlansList plans={plans.data} /> : <PageSpinner />}</Panel>
      <Panel
        title="Series"
        actions={
          canEdit && (
            <Button size="sm" variant="secondary" onClick={() => setCreatingSeries(true)}>
              New series
            </Button>
          )
        }
      >
        {series.data ? <SeriesList series={series.data} /> : <PageSpinner />}
      </Panel>
      <Dialog open={creatingSeries} title="New series" onClose={() => setCreatingSeries(false)}>
        <CreateSeriesForm
          plans={(plans.data ?? []).filter((p) => !inSeries.has(p.id))}
          onCancel={() => setCreatingSeries(false)}
          onSuccess={(created) => {
            setCreatingSeries(false);
            navigate(paths.series.getHref(created.id));
          }}
        />
      </Dialog>
      <Dialog open={creating} title="New plan" onClose={() => setCreating(false)}>
        <CreatePlanForm
          stations={choices}
          onCancel={() => setCreating(false)}
          onSuccess={(plan) => {
            setCreating(false);
            navigate(paths.plan.getHref(plan.id));
          }}
        />
      </Dialog>
    </>
  );
}
