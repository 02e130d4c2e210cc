import { Fragment, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { OutsideItem, SeriesEva, SeriesView } from '@shared/schemas/series';
import { formatElapsed } from '@shared/compute/units';
import { Badge } from '@/components/ui/badge';
import { paths } from '@/config/paths';

const STATUS: Record<SeriesEva['status'], string> = {
  draft: 'Draft',
  'in-review': 'In review',
  approved: 'Approved',
};

function where(o: OutsideItem): string {
  switch (o.where.kind) {
    case 'installed':
      return `installed at ${o.where.node}`;
    case 'at':
      return `at ${o.where.node}`;
    default:
      return 'inside';
  }
}

function EvaCard({ eva, index, controls }: { eva: SeriesEva; index: number; controls?: ReactNode }) {
  return (
    <li
      className="w-64 shrink-0 rounded-md border border-surface-line bg-surface p-3"
      aria-label={`EVA ${index + 1}`}
    >
      <p className="text-xs font-semibold tracking-wide text-text-muted uppercase">EVA {index + 1}</p>
      <Link className="font-semibold text-accent-strong underline" to={paths.plan.getHref(eva.planId)}>
        {eva.title}
      </Link>
      <p className="mt-1 flex flex-wrap items-center gap-2 text-xs text-text-muted">
        <Badge
          tone={eva.status === 'approved' ? 'approved' : eva.status === 'in-review' ? 'review' : 'draft'}
        >
          {STATUS[eva.status]}
        </Badge>
        {eva.date}
      </p>
      <p className="mt-2 text-sm">
        Day ends {formatElapsed(eva.endSeconds)}, margin {formatElapsed(Math.abs(eva.marginSeconds))}
        {eva.marginSeconds < 0 ? ' over' : ''}
      </p>
      <p className="text-sm">
        {eva.warningCount === 0
          ? 'No warnings'
          : `${eva.warningCount} warning${eva.warningCount === 1 ? '' : 's'}`}
      </p>
      {eva.foundOutside.length > 0 && (
        <p className="mt-1 text-xs text-text-muted">
          Starts with {eva.foundOutside.map((o) => `${o.name} ${where(o)}`).join('; ')}
        </p>
      )}
      {eva.carriedOver.length > 0 && (
        <ul
          className="mt-2 list-disc pl-4 text-xs text-caution"
          aria-label={`Carried-over warnings of EVA ${index + 1}`}
        >
          {eva.carriedOver.map((w, i) => (
            <li key={i}>{w.message}</li>
          ))}
        </ul>
      )}
      {controls}
    </li>
  );
}

function Between({ items, after }: { items: OutsideItem[]; after: number }) {
  return (
    <li
      className="flex w-48 shrink-0 flex-col justify-center px-2 text-xs"
      aria-label={`Outside after EVA ${after + 1}`}
    >
      <p className="font-semibold text-text-strong">Stays outside</p>
      {items.length ? (
        <ul className="mt-1 space-y-1">
          {items.map((o) => (
            <li key={o.item}>
              {o.name} <span className="text-text-muted">{where(o)}</span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-text-muted">nothing</p>
      )}
    </li>
  );
}

/** The EVAs of a series in order, with what stays outside between each and the next (and after the last). */
export function SeriesStrip({
  series,
  controls,
}: {
  series: SeriesView;
  /** per EVA: buttons to move or remove it (for those who edit plans) */
  controls?: (index: number) => ReactNode;
}) {
  return (
    <ol className="flex items-stretch gap-2 overflow-x-auto pb-2" aria-label="EVAs of the series">
      {series.evas.map((eva, i) => (
        <Fragment key={eva.planId}>
          <EvaCard eva={eva} index={i} controls={controls?.(i)} />
          <Between items={eva.outsideAfter} after={i} />
        </Fragment>
      ))}
    </ol>
  );
}
