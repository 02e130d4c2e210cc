import { z } from 'zod';
import type { ImportStationResult, StationCounts } from '@shared/schemas/station-edits';
import { Alert } from '@/components/ui/alert';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { apiErrorMessage, isApiError } from '@/lib/api-client';
import { useImportStation, useReplaceStationModel } from '../api/import-station';

const MAX_BYTES = 50 * 1024 * 1024;

const ImportFormSchema = z.object({
  file: z
    .custom<FileList>(
      (v) => typeof FileList !== 'undefined' && v instanceof FileList && v.length === 1,
      'Choose one station document file (.json).',
    )
    .refine((files) => files[0].size <= MAX_BYTES, 'The file is larger than 50 MB.'),
});
type ImportFormValues = z.infer<typeof ImportFormSchema>;

export function CountsSummary({ counts }: { counts: StationCounts }) {
  return (
    <dl className="mt-2 grid grid-cols-4 gap-2" aria-label="Imported counts">
      {(['nodes', 'edges', 'hazards', 'segments'] as const).map((k) => (
        <div key={k} className="rounded bg-white/60 px-2 py-1 text-center">
          <dt className="text-xs capitalize">{k}</dt>
          <dd className="text-base font-semibold" data-testid={`count-${k}`}>
            {counts[k]}
          </dd>
        </div>
      ))}
    </dl>
  );
}

/** Every problem the server found, by JSON path or CSV line, so the whole file can be fixed in one go. */
export function ImportProblems({ error }: { error: unknown }) {
  if (!error) return null;
  const details = isApiError(error) ? error.details : [];
  return (
    <Alert tone="danger" title="Nothing was imported">
      <p>{apiErrorMessage(error, 'The import failed.')}</p>
      {details.length > 0 && (
        <>
          <p className="mt-2 font-medium">
            {details.length} problem{details.length === 1 ? '' : 's'}:
          </p>
          <ol
            className="mt-1 max-h-56 list-decimal space-y-0.5 overflow-y-auto pl-6"
            aria-label="Import problems"
          >
            {details.map((d, i) => (
              <li key={i}>
                <code className="font-mono font-semibold">{d.path}</code> — {d.message}
              </li>
            ))}
          </ol>
        </>
      )}
    </Alert>
  );
}

type ImportTarget = { mode: 'new' } | { mode: 'replace'; stationId: number; version: number };

/**
 * Uploads a station document: as a new station, or replacing a station's whole model (all or
 * nothing on the server; a replace names the version on screen so a stale one is refused).
 */
export function ImportStationForm({
  target,
  onSuccess,
}: {
  target: ImportTarget;
  onSuccess?: (result: ImportStationResult) => void;
}) {
  const create = useImportStation({ onSuccess });
  const replace = useReplaceStationModel({ onSuccess });
  const mutation = target.mode === 'new' ? create : replace;
  const form = useZodForm(ImportFormSchema);
  const {
    register,
    formState: { errors },
  } = form;

  const submit = ({ file }: ImportFormValues) => {
    if (target.mode === 'new') create.mutate(file[0]);
    else replace.mutate({ stationId: target.stationId, version: target.version, file: file[0] });
  };

  return (
    <Form form={form} onSubmit={submit}>
      <Field
        label="Station document"
        error={errors.file?.message}
        hint={
          target.mode === 'new'
            ? 'A Tetherwise station document (JSON), e.g. one exported from another station.'
            : 'Replaces every segment, node, edge and hazard of this station. Plans keep their node keys, so keep the keys they use.'
        }
      >
        <Input type="file" accept=".json,application/json" className="py-1.5" {...register('file')} />
      </Field>
      <ImportProblems error={mutation.error} />
      {mutation.isSuccess && (
        <Alert
          tone="success"
          title={target.mode === 'new' ? `Imported “${mutation.data.station.name}”` : 'Model replaced'}
        >
          <CountsSummary counts={mutation.data.counts} />
        </Alert>
      )}
      <FormActions
        submit={target.mode === 'new' ? 'Import station' : 'Replace model'}
        variant={target.mode === 'new' ? 'primary' : 'danger'}
        isLoading={mutation.isPending}
      />
    </Form>
  );
}
