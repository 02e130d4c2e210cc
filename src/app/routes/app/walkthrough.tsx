import type { QueryClient } from '@tanstack/react-query';
import { useParams, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { PageSpinner } from '@/components/ui/spinner';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api-client';
import { requireUser } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { getWalkthroughQueryOptions, useWalkthrough } from '@/features/walkthrough/api/get-walkthrough';
import { WalkthroughPlayer } from '@/features/walkthrough/components/walkthrough-player';
import { PlaybackScene } from './playback-scene';

function walkthroughId(params: { id?: string }): number {
  const id = Number(params.id);
  if (!Number.isInteger(id) || id <= 0) throw new ApiError(404, 'NOT_FOUND', 'There is no such walkthrough.');
  return id;
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    await queryClient.ensureQueryData(getWalkthroughQueryOptions(walkthroughId(params)));
    return null;
  };

export default function WalkthroughRoute() {
  const id = walkthroughId(useParams());
  const [searchParams] = useSearchParams();
  const query = useWalkthrough(id);
  if (!query.data) return <PageSpinner />;
  const detail = query.data;
  const { walkthrough } = detail;
  const printView = searchParams.get('print') === '1';
  return (
    <>
      {!printView && (
        <PageHeader
          compact
          title={walkthrough.name}
          description={
            <>
              {walkthrough.plan ? (
                <>
                  Plan{' '}
                  <TextLink to={paths.plan.getHref(walkthrough.plan.id)}>{walkthrough.plan.title}</TextLink>{' '}
                  <Badge
                    tone={
                      walkthrough.plan.status === 'approved'
                        ? 'approved'
                        : walkthrough.plan.status === 'in-review'
                          ? 'review'
                          : 'draft'
                    }
                  >
                    {walkthrough.plan.status}
                  </Badge>
                </>
              ) : (
                <>
                  Route {walkthrough.route?.from} → {walkthrough.route?.to} ({walkthrough.route?.mode})
                </>
              )}{' '}
              on {walkthrough.stationName} · saved by {walkthrough.authorName ?? 'a former user'},{' '}
              {formatDateTime(walkthrough.updatedAt)}
            </>
          }
          actions={<TextLink to={paths.walkthroughs.getHref()}>All walkthroughs</TextLink>}
        />
      )}
      {detail.playback ? (
        <WalkthroughPlayer detail={detail} printView={printView} Scene={PlaybackScene} />
      ) : (
        <Alert tone="danger" title="This walkthrough cannot be played back now">
          {detail.unavailableReason}
        </Alert>
      )}
    </>
  );
}
