import type { Annotation } from '@shared/schemas/annotations';
import { Badge } from '@/components/ui/badge';
import { formatDateTime } from '@/lib/format';

/** Open and resolved differ by symbol and word, never by colour alone (the 3D pins: ball on a stalk vs ring). */
export function StatusBadge({ status }: { status: Annotation['status'] }) {
  return status === 'open' ? (
    <Badge tone="caution">
      <span aria-hidden="true">●&nbsp;</span>open
    </Badge>
  ) : (
    <Badge tone="approved">
      <span aria-hidden="true">◯&nbsp;</span>resolved
    </Badge>
  );
}

const fmt = (v: number) => v.toFixed(2);

export function pinText(a: Pick<Annotation, 'nodeKey' | 'position'>): string {
  if (a.nodeKey) return `node ${a.nodeKey}`;
  const [x, y, z] = a.position;
  return `point (${fmt(x)}, ${fmt(y)}, ${fmt(z)}) m`;
}

export function Byline({ name, at }: { name: string | undefined; at: string }) {
  return (
    <span className="text-xs text-text-muted">
      {name ?? 'Former user'} · <time dateTime={at}>{formatDateTime(at)}</time>
    </span>
  );
}
