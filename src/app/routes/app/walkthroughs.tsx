import { useState } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { requireUser, useCan } from '@/lib/authorization';
import { usePlans } from '@/features/plans/api/get-plans';
import { useStations } from '@/features/stations/api/get-stations';
import { getWalkthroughsQueryOptions, useWalkthroughs } from '@/features/walkthrough/api/get-walkthroughs';
import { NewWalkthroughForm } from '@/features/walkthrough/components/new-walkthrough-form';
import { WalkthroughsTable } from '@/features/walkthrough/components/walkthroughs-table';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getWalkthroughsQueryOptions());
    return null;
  };

function NewWalkthroughDialog({ defaultPlanId, onClose }: { defaultPlanId?: number; onClose: () => void }) {
  const navigate = useNavigate();
  const plans = usePlans();
  const stations = useStations();
  return (
    <Dialog open title="New walkthrough" onClose={onClose}>
      {plans.data && stations.data ? (
        <NewWalkthroughForm
          plans={plans.data}
          stations={stations.data}
          defaultPlanId={defaultPlanId}
          onCancel={onClose}
          onSuccess={(detail) => navigate(paths.walkthrough.getHref(detail.walkthrough.id))}
        />
      ) : (
        <PageSpinner />
      )}
    </Dialog>
  );
}

export default function WalkthroughsRoute() {
  const canEdit = useCan('walkthroughs:edit');
  const walkthroughs = useWalkthroughs();
  const [searchParams, setSearchParams] = useSearchParams();
  const planParam = Number(searchParams.get('planId'));
  const defaultPlanId = Number.isInteger(planParam) && planParam > 0 ? planParam : undefined;
  const [creating, setCreating] = useState(canEdit && defaultPlanId !== undefined);

  return (
    <>
      <PageHeader
        title="Walkthroughs"
        description="Saved training playbacks of a plan or a single route: the crew marker, the live tether and every swap, with trainer notes and printable step cards."
        actions={canEdit && <Button onClick={() => setCreating(true)}>New walkthrough</Button>}
      />
      <Panel>
        {walkthroughs.data ? <WalkthroughsTable walkthroughs={walkthroughs.data} /> : <PageSpinner />}
      </Panel>
      {creating && (
        <NewWalkthroughDialog
          defaultPlanId={defaultPlanId}
          onClose={() => {
            setCreating(false);
            if (defaultPlanId) setSearchParams({});
          }}
        />
      )}
    </>
  );
}
