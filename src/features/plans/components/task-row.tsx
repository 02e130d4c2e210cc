import type { HTMLAttributes, Ref } from 'react';
import type { Task } from '@shared/schemas/plan';
import { formatElapsed } from '@shared/compute/units';
import { Badge } from '@/components/ui/badge';
import { Button, focusRing } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import type { TaskReach } from '../types';

export const taskRowId = (index: number) => `plan-task-${index + 1}`;

function ReachStatus({ reach }: { reach?: TaskReach }) {
  if (!reach) return null;
  if (!reach.reach) return <Badge tone="danger">⚠ socket unusable</Badge>;
  const r = reach.reach;
  return r.reachable ? (
    <Badge tone="approved">
      ✓ in reach · restraint set yaw {r.yawSetDeg}° pitch {r.pitchSetDeg}°
    </Badge>
  ) : (
    <Badge tone="danger">⚠ out of reach by {(r.distanceM - r.radiusM).toFixed(2)} m</Badge>
  );
}

/** The drag and keyboard handlers a row passes to its list item. */
export type TaskRowHandlers = Pick<
  HTMLAttributes<HTMLLIElement>,
  'onDragStart' | 'onDragOver' | 'onDrop' | 'onDragEnd' | 'onKeyDown'
>;

interface TaskRowProps {
  task: Task;
  index: number;
  count: number;
  readOnly: boolean;
  worksiteLabel?: string;
  reach?: TaskReach;
  warnings: number;
  /** 1-based positions of the tasks this one waits for */
  after: number[];
  /** this row is being dragged */
  dragged: boolean;
  /** another row is being dragged over this one */
  dropTarget: boolean;
  rowRef: Ref<HTMLLIElement>;
  handlers: TaskRowHandlers;
  onMove: (to: number) => void;
  onEdit: () => void;
  onRemove: () => void;
}

/** One task of the list: what, where, who, how long, and its reach and warnings; reorder and edit. */
export function TaskRow({
  task: t,
  index: i,
  count,
  readOnly,
  worksiteLabel,
  reach,
  warnings,
  after,
  dragged,
  dropTarget,
  rowRef,
  handlers,
  onMove,
  onEdit,
  onRemove,
}: TaskRowProps) {
  return (
    <li
      id={taskRowId(i)}
      ref={rowRef}
      tabIndex={0}
      aria-describedby="task-reorder-help"
      aria-label={`Task ${i + 1} of ${count}: ${t.title}`}
      draggable={!readOnly}
      {...handlers}
      className={cn(
        'flex flex-wrap items-start gap-3 rounded-md border bg-surface-panel px-3 py-2',
        focusRing,
        dropTarget ? 'border-accent border-dashed' : 'border-surface-line',
        dragged && 'opacity-60',
      )}
    >
      {!readOnly && (
        <span
          aria-hidden="true"
          title="Drag to reorder"
          className="cursor-grab pt-0.5 text-lg leading-none text-text-muted"
        >
          ⠿
        </span>
      )}
      <span className="w-6 pt-0.5 text-sm font-semibold text-text-muted">{i + 1}.</span>
      <div className="min-w-0 flex-1 space-y-0.5">
        <p className="font-medium text-text-strong">{t.title}</p>
        <p className="text-sm text-text">
          {t.worksite}
          {worksiteLabel && <span className="text-text-muted"> — {worksiteLabel}</span>} ·{' '}
          {t.crew === 'both' ? 'EV1 + EV2' : t.crew} · {formatElapsed(t.durationSeconds)}
          {t.socket && <> · socket {t.socket}</>}
        </p>
        <div className="flex flex-wrap gap-1.5 empty:hidden">
          {t.eclipseOnly && <Badge tone="accent">☾ Eclipse-only</Badge>}
          {t.carrying && <Badge tone="neutral">Carrying</Badge>}
          {t.optional && <Badge tone="neutral">Optional (get-ahead)</Badge>}
          {after.length > 0 && (
            <Badge tone="neutral">
              ⤷ After task{after.length === 1 ? '' : 's'} {after.join(', ')}
            </Badge>
          )}
          <ReachStatus reach={reach} />
          {warnings > 0 && (
            <Badge tone="danger">
              ⚠ {warnings} warning{warnings === 1 ? '' : 's'}
            </Badge>
          )}
          {t.tools.map((tool) => (
            <Badge key={tool} tone="neutral">
              🔧 {tool}
            </Badge>
          ))}
        </div>
      </div>
      {!readOnly && (
        <div className="flex flex-wrap gap-1">
          <Button
            size="sm"
            variant="ghost"
            disabled={i === 0}
            onClick={() => onMove(i - 1)}
            aria-label={`Move task ${i + 1} up`}
          >
            ↑ Up
          </Button>
          <Button
            size="sm"
            variant="ghost"
            disabled={i === count - 1}
            onClick={() => onMove(i + 1)}
            aria-label={`Move task ${i + 1} down`}
          >
            ↓ Down
          </Button>
          <Button size="sm" variant="secondary" onClick={onEdit} aria-label={`Edit task ${i + 1}`}>
            Edit
          </Button>
          <Button
            size="sm"
            variant="ghost"
            className="text-danger"
            aria-label={`Remove task ${i + 1}`}
            onClick={onRemove}
          >
            Remove
          </Button>
        </div>
      )}
    </li>
  );
}
