import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { StationSummary } from '@shared/schemas/station-edits';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { FormError } from '@/components/ui/form-error';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { useDeleteStation } from '../api/delete-station';

/** The plans a refused delete names: `details` entries `plans.<id>` with "<title> (<status>)". */
function plansInTheWay(error: unknown) {
  if (!isApiError(error) || error.status !== 409) return [];
  return error.details
    .map((d) => ({ id: Number(/^plans\.(\d+)$/.exec(d.path)?.[1]), text: d.message }))
    .filter((p) => Number.isInteger(p.id) && p.id > 0);
}

/**
 * Deletes the station after asking; a station that plans use is refused by the server, and the
 * dialog then lists those plans (each a link) instead of the delete.
 */
export function DeleteStationButton({
  station,
}: {
  station: Pick<StationSummary, 'id' | 'name' | 'version'>;
}) {
  const navigate = useNavigate();
  const [asking, setAsking] = useState(false);
  const remove = useDeleteStation({ onSuccess: () => void navigate(paths.stations.getHref()) });
  const using = plansInTheWay(remove.error);
  return (
    <>
      <Button
        variant="secondary"
        onClick={() => {
          remove.reset();
          setAsking(true);
        }}
      >
        Delete station…
      </Button>
      <ConfirmDialog
        open={asking}
        title={`Delete ${station.name}?`}
        confirmLabel="Delete station"
        isLoading={remove.isPending}
        canConfirm={using.length === 0}
        onCancel={() => setAsking(false)}
        onConfirm={() => remove.mutate({ id: station.id, version: station.version })}
      >
        {using.length === 0 ? (
          <>
            <p>
              The model, its history, its notes (with their images) and its walkthroughs go for good. A
              station that plans use cannot be deleted.
            </p>
            <FormError error={remove.error} fallback="The station could not be deleted." />
          </>
        ) : (
          <Alert tone="caution" title="Plans use this station">
            <p>
              {using.length === 1 ? 'This plan is' : `These ${using.length} plans are`} checked against{' '}
              {station.name}; delete {using.length === 1 ? 'it' : 'them'} or move{' '}
              {using.length === 1 ? 'it' : 'them'} to another station first. Nothing was deleted.
            </p>
            <ul className="mt-2 max-h-60 list-disc overflow-y-auto pl-5" aria-label="Plans using the station">
              {using.map((p) => (
                <li key={p.id}>
                  <Link className="underline" to={paths.plan.getHref(p.id)}>
                    {p.text}
                  </Link>
                </li>
              ))}
            </ul>
          </Alert>
        )}
      </ConfirmDialog>
    </>
  );
}
