import { useEffect, useRef, useState, type KeyboardEvent } from 'react';
import type { Task } from '@shared/schemas/plan';
import { formatElapsed } from '@shared/compute/units';
import { Badge } from '@/components/ui/badge';
import { Button, focusRing } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { cn } from '@/lib/cn';
import { moveItem } from '../lib/plan-draft';
import type { PlanStationNodes, TaskReach } from '../types';
import { TaskForm } from './task-form';

export const taskRowId = (index: number) => `plan-task-${index + 1}`;

function ReachStatus({ reach }: { reach?: TaskReach }) {
  if (!reach) return null;
  if (!reach.reach) return <Badge tone="danger">⚠ socket unusable</Badge>;
  const r = reach.reach;
  return r.reachable ? (
    <Badge tone="approved">
      ✓ in reach · restraint yaw {r.yawDeg}° pitch {r.pitchDeg}°
    </Badge>
  ) : (
    <Badge tone="danger">⚠ out of reach by {(r.distanceM - r.radiusM).toFixed(2)} m</Badge>
  );
}

interface TasksEditorProps {
  tasks: Task[];
  onChange: (tasks: Task[]) => void;
  readOnly: boolean;
  nodes: PlanStationNodes;
  toolNames: string[];
  /** reach of each task's socket, as the server computed it for the saved plan */
  reach: TaskReach[];
  /** how many warnings of the saved plan name each task, by index */
  warningCounts: Map<number, number>;
}

export function TasksEditor({
  tasks,
  onChange,
  readOnly,
  nodes,
  toolNames,
  reach,
  warningCounts,
}: TasksEditorProps) {
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const [announcement, setAnnouncement] = useState('');
  const focusAfterMove = useRef<number | null>(null);
  const [dragFrom, setDragFrom] = useState<number | null>(null);
  const [dropAt, setDropAt] = useState<number | null>(null);
  const rows = useRef<(HTMLLIElement | null)[]>([]);
  const labelOf = (key: string) => nodes.worksites.find((n) => n.key === key)?.label;

  useEffect(() => {
    if (focusAfterMove.current === null) return;
    rows.current[focusAfterMove.current]?.focus();
    focusAfterMove.current = null;
  }, [tasks]);

  const move = (from: number, to: number) => {
    if (readOnly || to < 0 || to >= tasks.length || from === to) return;
    onChange(moveItem(tasks, from, to));
    setAnnouncement(`Moved task “${tasks[from].title}” to position ${to + 1} of ${tasks.length}.`);
    focusAfterMove.current = to;
  };

  const onRowKey = (index: number) => (e: KeyboardEvent<HTMLLIElement>) => {
    if (e.target !== e.currentTarget || !e.altKey) return;
    if (e.key === 'ArrowUp') {
      e.preventDefault();
      move(index, index - 1);
    } else if (e.key === 'ArrowDown') {
      e.preventDefault();
      move(index, index + 1);
    }
  };

  const save = (task: Task) => {
    if (editing === 'new') {
      onChange([...tasks, task]);
      setAnnouncement(`Added task “${task.title}” as number ${tasks.length + 1}.`);
    } else if (editing !== null) {
      onChange(tasks.map((t, i) => (i === editing ? task : t)));
      setAnnouncement(`Changed task ${editing + 1} “${task.title}”.`);
    }
    setEditing(null);
  };

  return (
    <div className="space-y-3">
      <p id="task-reorder-help" className="text-xs text-text-muted">
        Drag a task by its handle, use Move up and Move down, or focus a task and press Alt+↑ or Alt+↓.
      </p>
      {tasks.length === 0 ? (
        <EmptyState>No tasks yet. Add the first task of the EVA.</EmptyState>
      ) : (
        <ol aria-label="Tasks" className="space-y-2">
          {tasks.map((t, i) => {
            const r = reach.find(
              (x) => x.taskIndex === i && x.socket === t.socket && x.worksite === t.worksite,
            );
            return (
              <li
                key={`${t.id ?? 'new'}-${i}`}
                id={taskRowId(i)}
                ref={(el) => {
                  rows.current[i] = el;
                }}
                tabIndex={0}
                aria-describedby="task-reorder-help"
                aria-label={`Task ${i + 1} of ${tasks.length}: ${t.title}`}
                draggable={!readOnly}
                onDragStart={(e) => {
                  setDragFrom(i);
                  e.dataTransfer.effectAllowed = 'move';
                  e.dataTransfer.setData('text/plain', String(i));
                }}
                onDragOver={(e) => {
                  if (dragFrom === null) return;
                  e.preventDefault();
                  setDropAt(i);
                }}
                onDrop={(e) => {
                  e.preventDefault();
                  if (dragFrom !== null) move(dragFrom, i);
                  setDragFrom(null);
                  setDropAt(null);
                }}
                onDragEnd={() => {
                  setDragFrom(null);
                  setDropAt(null);
                }}
                onKeyDown={onRowKey(i)}
                className={cn(
                  'flex flex-wrap items-start gap-3 rounded-md border bg-surface-panel px-3 py-2.5',
                  focusRing,
                  dropAt === i && dragFrom !== i ? 'border-accent border-dashed' : 'border-surface-line',
                  dragFrom === i && 'opacity-60',
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
                <div className="min-w-0 flex-1 space-y-1">
                  <p className="font-medium text-text-strong">{t.title}</p>
                  <p className="text-sm text-text">
                    {t.worksite}
                    {labelOf(t.worksite) && (
                      <span className="text-text-muted"> — {labelOf(t.worksite)}</span>
                    )}{' '}
                    · {t.crew === 'both' ? 'EV1 + EV2' : t.crew} · {formatElapsed(t.durationSeconds)}
                    {t.socket && <> · socket {t.socket}</>}
                  </p>
                  <div className="flex flex-wrap gap-1.5">
                    {t.eclipseOnly && <Badge tone="accent">☾ Eclipse only</Badge>}
                    {t.carrying && <Badge tone="neutral">Carrying</Badge>}
                    <ReachStatus reach={r} />
                    {(warningCounts.get(i) ?? 0) > 0 && (
                      <Badge tone="danger">
                        ⚠ {warningCounts.get(i)} warning{warningCounts.get(i) === 1 ? '' : 's'}
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
                      onClick={() => move(i, i - 1)}
                      aria-label={`Move task ${i + 1} up`}
                    >
                      ↑ Up
                    </Button>
                    <Button
                      size="sm"
                      variant="ghost"
                      disabled={i === tasks.length - 1}
                      onClick={() => move(i, i + 1)}
                      aria-label={`Move task ${i + 1} down`}
                    >
                      ↓ Down
                    </Button>
                    <Button
                      size="sm"
                      variant="secondary"
                      onClick={() => setEditing(i)}
                      aria-label={`Edit task ${i + 1}`}
                    >
                      Edit
                    </Button>
                    <Button
                      size="sm"
                      variant="ghost"
                      className="text-danger"
                      aria-label={`Remove task ${i + 1}`}
                      onClick={() => {
                        onChange(tasks.filter((_, k) => k !== i));
                        setAnnouncement(`Removed task “${t.title}”.`);
                      }}
                    >
                      Remove
                    </Button>
                  </div>
                )}
              </li>
            );
          })}
        </ol>
      )}
      <p aria-live="polite" className="sr-only">
        {announcement}
      </p>
      {!readOnly && (
        <Button variant="secondary" onClick={() => setEditing('new')} disabled={nodes.worksites.length === 0}>
          Add task
        </Button>
      )}
      <Dialog
        open={editing !== null}
        title={editing === 'new' ? 'Add task' : `Edit task ${(editing ?? 0) + 1}`}
        onClose={() => setEditing(null)}
      >
        <TaskForm
          task={typeof editing === 'number' ? tasks[editing] : undefined}
          nodes={nodes}
          toolNames={toolNames}
          onSubmit={save}
          onCancel={() => setEditing(null)}
        />
      </Dialog>
    </div>
  );
}
