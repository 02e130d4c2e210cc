import { useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import type { AffectedPlan } from '@shared/schemas/plan-views';
import { AffectedPlansPrompt, InlineConfirm } from '@/components/affected-plans-prompt';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import {
  previewStationCsv,
  useImportStationCsv,
  type CsvFiles,
  type CsvMergeCounts,
} from '../api/import-station-csv';
import { ImportProblems } from './import-station-form';

const FIELDS = [
  { field: 'nodes', label: 'Nodes CSV', hint: 'key,kind,label,x,y,z,nx,ny,nz,notes: upserted by key' },
  {
    field: 'edges',
    label: 'Edges CSV',
    hint: 'from,to,kind,lengthM,closed: upserted by their two ends and kind',
  },
  { field: 'arms', label: 'Arms CSV', hint: 'key,label,baseNode,reachM,minReachM,tipSpeedMps,settleSeconds' },
] as const;

/**
 * Merges CSV tables into a station's model. The files are checked first (a dry run): every problem
 * of every file at once, or the plans in review or approved the change touches; the engineer
 * confirms, and the write is all or nothing against the version on screen.
 */
export function ImportCsvForm({ station }: { station: { id: number; name: string; version: number } }) {
  const [files, setFiles] = useState<CsvFiles>({});
  const [checked, setChecked] = useState<({ affectedPlans: AffectedPlan[] } & CsvMergeCounts) | null>(null);
  const preview = useMutation({ mutationFn: previewStationCsv });
  const write = useImportStationCsv();
  const chosen = Object.values(files).some(Boolean);
  const variables = { stationId: station.id, files, version: station.version };
  const reset = () => {
    setChecked(null);
    preview.reset();
    write.reset();
  };
  const confirm = () => write.mutate(variables, { onSuccess: () => setChecked(null) });
  const what = `import these CSV files into ${station.name}`;

  return (
    <form
      noValidate
      className="space-y-3"
      aria-label="Import CSV"
      onSubmit={(e) => {
        e.preventDefault();
        reset();
        preview.mutate(variables, { onSuccess: setChecked });
      }}
    >
      {FIELDS.map(({ field, label, hint }) => (
        <Field key={field} label={label} hint={hint}>
          <Input
            type="file"
            accept=".csv,text/csv"
            className="py-1.5"
            onChange={(e) => {
              const file = e.target.files?.[0];
              setFiles((f) => ({ ...f, [field]: file }));
              reset();
            }}
          />
        </Field>
      ))}
      <ImportProblems error={preview.error ?? write.error} />
      {checked && (
        <p data-testid="csv-check-counts" className="text-sm">
          The import {mergeSummary(checked, false)}
        </p>
      )}
      {checked &&
        (checked.affectedPlans.length ? (
          <AffectedPlansPrompt
            what={what}
            plans={checked.affectedPlans}
            isSaving={write.isPending}
            confirmLabel="Import anyway"
            onConfirm={confirm}
            onCancel={reset}
          />
        ) : (
          <Alert tone="info" title="The files check out">
            <p>
              Nothing is written yet. No plan in review or approved is touched. Import them into{' '}
              {station.name} (version {station.version})?
            </p>
            <InlineConfirm label="Import" isLoading={write.isPending} onConfirm={confirm} onCancel={reset} />
          </Alert>
        ))}
      {write.data && (
        <Alert
          tone="success"
          title={`Imported into ${write.data.station.name}: version ${write.data.station.version}`}
        >
          <p data-testid="csv-import-counts">Written: {mergeSummary(write.data, true)}</p>
        </Alert>
      )}
      {!checked && (
        <Button type="submit" disabled={!chosen} isLoading={preview.isPending}>
          Check the files
        </Button>
      )}
    </form>
  );
}

/** "adds 2 nodes and changes 1; adds 1 edge and changes 0." (once written, "added … changed …") */
function mergeSummary({ added, updated }: CsvMergeCounts, written: boolean) {
  const [add, change] = written ? ['added', 'changed'] : ['adds', 'changes'];
  const part = (one: string, a: number, c: number) =>
    `${add} ${a} ${a === 1 ? one : `${one}s`} and ${change} ${c}`;
  return `${part('node', added.nodes, updated.nodes)}; ${part('edge', added.edges, updated.edges)}.`;
}
