import { useState } from 'react';
import type { Annotation, AnnotationStatus } from '@shared/schemas/annotations';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { Spinner } from '@/components/ui/spinner';
import { useCan } from '@/lib/authorization';
import { useAnnotations } from '../api/get-annotations';
import { AnnotationList } from './annotation-list';
import { AnnotationThread } from './annotation-thread';
import { NewAnnotationForm, type PointPick } from './new-annotation-form';

type Filter = 'all' | AnnotationStatus;
const FILTERS: { value: Filter; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'resolved', label: 'Resolved' },
  { value: 'all', label: 'All' },
];

export interface AnnotationsPanelProps {
  stationId: number;
  selectedNodeKey: string | null;
  /** the latest surface click in the 3D view, for pinning a note to a point */
  pick: PointPick | null;
  /** the note whose thread is shown; the route shares it with the 3D pins */
  openId: number | null;
  onOpen: (id: number | null) => void;
}

export function AnnotationsPanel({
  stationId,
  selectedNodeKey,
  pick,
  openId,
  onOpen,
}: AnnotationsPanelProps) {
  const canWrite = useCan('annotations:write');
  const [filter, setFilter] = useState<Filter>('open');
  const [composing, setComposing] = useState(false);
  const notes = useAnnotations(stationId);

  if (notes.isPending) return <Spinner label="Loading notes" />;
  if (notes.isError) return <FormError error={notes.error} fallback="The notes could not be loaded." />;

  const open = openId !== null ? notes.data.find((a) => a.id === openId) : undefined;
  if (open) return <AnnotationThread annotation={open} onBack={() => onOpen(null)} />;

  if (composing) {
    return (
      <NewAnnotationForm
        stationId={stationId}
        selectedNodeKey={selectedNodeKey}
        pick={pick}
        onCreated={(a: Annotation) => {
          setComposing(false);
          onOpen(a.id);
        }}
        onCancel={() => setComposing(false)}
      />
    );
  }

  const count = (f: Filter) =>
    f === 'all' ? notes.data.length : notes.data.filter((a) => a.status === f).length;
  const shown = filter === 'all' ? notes.data : notes.data.filter((a) => a.status === filter);
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div
          role="group"
          aria-label="Show notes"
          className="inline-flex rounded-md border border-surface-line p-0.5"
        >
          {FILTERS.map((f) => (
            <Button
              key={f.value}
              size="sm"
              variant={filter === f.value ? 'primary' : 'ghost'}
              aria-pressed={filter === f.value}
              onClick={() => setFilter(f.value)}
            >
              {f.label} ({count(f.value)})
            </Button>
          ))}
        </div>
        {canWrite && (
          <Button size="sm" onClick={() => setComposing(true)}>
            New note
          </Button>
        )}
      </div>
      <p className="text-xs text-text-muted">
        In 3D, an open note is a blue ball on a stalk standing on its spot; a resolved one is a grey ring
        above it. Click a pin to open its thread.
      </p>
      <AnnotationList annotations={shown} onOpen={(id) => onOpen(id)} />
    </div>
  );
}
