import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import type { ImportStationPreview, ImportStationResult, StationCounts } from '@shared/schemas/station-edits';
import { AffectedPlansPrompt, InlineConfirm } from '@/components/affected-plans-prompt';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { Input } from '@/components/ui/input';
import { apiErrorMessage, isApiError } from '@/lib/api-client';
import {
  previewStationImport,
  previewStationReplace,
  useImportStation,
  useReplaceStationModel,
} from '../api/import-station';

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

type ImportTarget = { mode: 'new' } | { mode: 'replace'; stationId: number; version: number; name: string };

/** What the form asks before it writes. */
type Asking =
  | { kind: 'name-taken'; file: File; preview: ImportStationPreview }
  | {
      kind: 'replace';
      file: File;
      station: { id: number; name: string; version: number };
      affectedPlans: AffectedPlan[];
    };

/** A name no station of `taken` has: "Name (2)", "Name (3)", … */
function freeName(name: string, taken: readonly string[]) {
  for (let i = 2; ; i++) {
    const next = `${name} (${i})`.slice(0, 200);
    if (!taken.includes(next)) return next;
  }
}

/** Where an import as a new station meets a station of the same name: rename, replace it, or stop. */
function NameTaken({
  preview,
  stationNames,
  isLoading,
  onRename,
  onReplace,
  onCancel,
}: {
  preview: ImportStationPreview;
  stationNames: readonly string[];
  isLoading: boolean;
  onRename: (name: string) => void;
  onReplace: (station: ImportStationPreview['sameName'][number]) => void;
  onCancel: () => void;
}) {
  const [name, setName] = useState(() => freeName(preview.name, stationNames));
  const existing = preview.sameName[preview.sameName.length - 1];
  const clash = stationNames.includes(name.trim());
  return (
    <Alert tone="caution" title={`A station named “${preview.name}” exists already`}>
      <p>
        Import the document as a new station under another name, replace the model of the existing{' '}
        {preview.name} (version {existing.version}) with it, or stop here. Nothing has been written yet.
      </p>
      <div className="mt-3 space-y-3">
        <Field
          label="New station's name"
          error={!name.trim() ? 'a station needs a name' : clash ? 'this name is taken too' : undefined}
        >
          <Input value={name} maxLength={200} onChange={(e) => setName(e.target.value)} />
        </Field>
        <div className="flex flex-wrap gap-2">
          <Button
            size="sm"
            isLoading={isLoading}
            disabled={!name.trim() || clash}
            onClick={() => onRename(name.trim())}
          >
            Import as “{name.trim() || '…'}”
          </Button>
          <Button size="sm" variant="secondary" disabled={isLoading} onClick={() => onReplace(existing)}>
            Replace the model of {preview.name}…
          </Button>
          <Button size="sm" variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      </div>
    </Alert>
  );
}

/** Asked before a replace is written: the reviewed plans it touches, or that it touches none. */
function ReplaceConfirm({
  asking,
  isLoading,
  onConfirm,
  onCancel,
}: {
  asking: Extract<Asking, { kind: 'replace' }>;
  isLoading: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const what = `replace the model of ${asking.station.name}`;
  if (asking.affectedPlans.length)
    return (
      <AffectedPlansPrompt
        what={what}
        plans={asking.affectedPlans}
        isSaving={isLoading}
        confirmLabel="Replace the model anyway"
        onConfirm={onConfirm}
        onCancel={onCancel}
      />
    );
  return (
    <Alert
      tone="info"
      title={`Replace the model of ${asking.station.name} (version ${asking.station.version})?`}
    >
      <p>
        Every segment, node, edge and hazard is replaced by the document&apos;s. No plan in review or approved
        is touched; drafts keep their node keys, so keep the keys they use.
      </p>
      <InlineConfirm
        label="Replace the model"
        variant="danger"
        isLoading={isLoading}
        onConfirm={onConfirm}
        onCancel={onCancel}
      />
    </Alert>
  );
}

/**
 * Uploads a station document: as a new station, or replacing a station's whole model (all or
 * nothing on the server; a replace names the version on screen so a stale one is refused). Both ask
 * first with a dry run: a new station whose name is taken is renamed, replaces that station, or
 * stops; a replace names the reviewed plans it touches before anything is written.
 */
export function ImportStationForm({
  target,
  stationNames = [],
  onSuccess,
}: {
  target: ImportTarget;
  /** the names of the stations there are (a new name is checked against them) */
  stationNames?: readonly string[];
  onSuccess?: (result: ImportStationResult) => void;
}) {
  const [asking, setAsking] = useState<Asking | null>(null);
  const create = useImportStation({ onSuccess });
  const replace = useReplaceStationModel({ onSuccess });
  const previewNew = useMutation({ mutationFn: previewStationImport });
  const previewReplace = useMutation({ mutationFn: previewStationReplace });
  const mutations = [create, replace, previewNew, previewReplace];
  const failed = mutations.find((m) => m.error)?.error;
  const done = create.isSuccess ? create.data : replace.isSuccess ? replace.data : null;
  const form = useZodForm(ImportFormSchema);
  const {
    register,
    formState: { errors },
  } = form;

  const askReplace = (file: File, station: { id: number; name: string; version: number }) =>
    previewReplace.mutate(
      { stationId: station.id, file, version: station.version },
      { onSuccess: (r) => setAsking({ kind: 'replace', file, station, affectedPlans: r.affectedPlans }) },
    );

  const submit = ({ file }: ImportFormValues) => {
    for (const m of mutations) m.reset();
    setAsking(null);
    if (target.mode === 'new')
      previewNew.mutate(
        { file: file[0] },
        {
          onSuccess: (preview) => {
            if (preview.sameName.length === 0) create.mutate({ file: file[0] });
            else setAsking({ kind: 'name-taken', file: file[0], preview });
          },
        },
      );
    else askReplace(file[0], { id: target.stationId, name: target.name, version: target.version });
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
        <Input
          type="file"
          accept=".json,application/json"
          className="py-1.5"
          {...register('file', { onChange: () => setAsking(null) })}
        />
      </Field>
      <ImportProblems error={failed} />
      {asking?.kind === 'name-taken' && (
        <NameTaken
          preview={asking.preview}
          stationNames={stationNames}
          isLoading={create.isPending || previewReplace.isPending}
          onRename={(name) => {
            create.mutate({ file: asking.file, name }, { onSuccess: () => setAsking(null) });
          }}
          onReplace={(station) => askReplace(asking.file, station)}
          onCancel={() => setAsking(null)}
        />
      )}
      {asking?.kind === 'replace' && (
        <ReplaceConfirm
          asking={asking}
          isLoading={replace.isPending}
          onCancel={() => setAsking(null)}
          onConfirm={() =>
            replace.mutate(
              { stationId: asking.station.id, file: asking.file, version: asking.station.version },
              { onSuccess: () => setAsking(null) },
            )
          }
        />
      )}
      {done && (
        <Alert
          tone="success"
          title={
            create.isSuccess ? `Imported “${done.station.name}”` : `Model of ${done.station.name} replaced`
          }
        >
          <CountsSummary counts={done.counts} />
        </Alert>
      )}
      {!asking && (
        <FormActions
          submit={target.mode === 'new' ? 'Import station' : 'Replace model'}
          variant={target.mode === 'new' ? 'primary' : 'danger'}
          isLoading={previewNew.isPending || previewReplace.isPending || create.isPending}
        />
      )}
    </Form>
  );
}
