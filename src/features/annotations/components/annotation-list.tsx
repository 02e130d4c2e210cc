import type { Annotation } from '@shared/schemas/annotations';
import { EmptyState } from '@/components/ui/card';
import { focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { Byline, StatusBadge, pinText } from './annotation-meta';

interface AnnotationListProps {
  annotations: readonly Annotation[];
  onOpen: (id: number) => void;
}

export function AnnotationList({ annotations, onOpen }: AnnotationListProps) {
  if (!annotations.length) return <EmptyState>No notes here.</EmptyState>;
  return (
    <ul className="space-y-2" aria-label="Notes">
      {annotations.map((a) => (
        <li key={a.id}>
          <button
            type="button"
            onClick={() => onOpen(a.id)}
            className={cn(
              'w-full rounded-md border border-surface-line bg-surface-panel px-3 py-2 text-left hover:bg-surface-sunken',
              focusRing,
            )}
          >
            <span className="flex items-start justify-between gap-2">
              <span className="font-medium text-text-strong">{a.title}</span>
              <StatusBadge status={a.status} />
            </span>
            <span className="mt-0.5 block">
              <Byline name={a.author?.name} at={a.createdAt} />
            </span>
            <span className="mt-0.5 block text-xs text-text">
              <span className="font-mono">{pinText(a)}</span> · {a.replies.length}{' '}
              {a.replies.length === 1 ? 'reply' : 'replies'}
              {a.attachments.length > 0 &&
                ` · ${a.attachments.length} image${a.attachments.length === 1 ? '' : 's'}`}
            </span>
            {a.attachments.length > 0 && (
              <span className="mt-1.5 flex gap-1.5">
                {a.attachments.slice(0, 4).map((f) => (
                  <img
                    key={f.id}
                    src={f.url}
                    alt={`Thumbnail: ${f.fileName}`}
                    loading="lazy"
                    className="size-12 rounded border border-surface-line object-cover"
                  />
                ))}
              </span>
            )}
          </button>
        </li>
      ))}
    </ul>
  );
}
