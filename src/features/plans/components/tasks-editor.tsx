import type { FlownEstimate } from '@shared/compute/day/flown-estimates';
import { useEffect, useRef, useState, type KeyboardEvent } from 'react';
import type { ManifestItem, Task } from '@shared/schemas/plan';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/card';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { Dialog } from '@/components/ui/dialog';
import { moveItem } from '../lib/plan-draft';
import { afterPositions, removeTask, waitingFor } from '../lib/task-order';
import type { PlanStationNodes, TaskReach } from '../types';
import { TaskForm } from './task-form';
import { TaskRow } from './task-row';

interface TasksEditorProps {
  tasks: Task[];
  /** the tasks, and items a task form put on the manifest */
  onChange: (tasks: Task[], added?: ManifestItem[]) => void;
  readOnly: boolean;
  nodes: PlanStationNodes;
  manifest: readonly ManifestItem[];
  /** reach of each task's socket, as the server computed it for the saved plan */
  reach: TaskReach[];
  /** how many warnings of the saved plan name each task, by index */
  warningCounts: Map<number, number>;
  /** what tasks took in runs that ended: offered as estimates in the task form */
  flownEstimates?: readonly FlownEstimate[];
}

export function TasksEditor({
  tasks,
  onChange,
  readOnly,
  nodes,
  manifest,
  reach,
  warningCounts,
  flownEstimates,
}: TasksEditorProps) {
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  // a form holding edits not applied asks before it closes (Escape, ✕, Cancel)
  const [formDirty, setFormDirty] = useState(false);
  const [askDrop, setAskDrop] = useState(false);
  const closeForm = () => {
    setEditing(null);
    setFormDirty(false);
    setAskDrop(false);
  };
  const dismissForm = () => (formDirty ? setAskDrop(true) : closeForm());
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

  // what the task being edited may wait for: the others, but not one that waits for it already
  const editingId = typeof editing === 'number' ? tasks[editing]?.id : undefined;
  const blocked = editingId === undefined ? new Set<number>() : waitingFor(tasks, editingId);
  const otherTasks = tasks.flatMap((t, i) =>
    i === editing
      ? []
      : [
          {
            id: t.id,
            title: t.title,
            position: i + 1,
            waitsForThis: t.id !== undefined && blocked.has(t.id),
          },
        ],
  );

  const save = (task: Task, added: ManifestItem[]) => {
    if (editing === 'new') {
      onChange([...tasks, task], added);
      setAnnouncement(`Added task “${task.title}” as number ${tasks.length + 1}.`);
    } else if (editing !== null) {
      onChange(
        tasks.map((t, i) => (i === editing ? task : t)),
        added,
      );
      setAnnouncement(`Changed task ${editing + 1} “${task.title}”.`);
    }
    closeForm();
  };

  return (
    <div className="space-y-3">
      {tasks.length === 0 ? (
        <EmptyState>No tasks yet. Add the first task of the EVA.</EmptyState>
      ) : (
        <ol aria-label="Tasks" className="space-y-2">
          {tasks.map((t, i) => (
            <TaskRow
              key={`${t.id ?? 'new'}-${i}`}
              task={t}
              index={i}
              count={tasks.length}
              readOnly={readOnly}
              worksiteLabel={labelOf(t.worksite)}
              reach={reach.find(
                (x) => x.taskIndex === i && x.socket === t.socket && x.worksite === t.worksite,
              )}
              warnings={warningCounts.get(i) ?? 0}
              after={afterPositions(tasks, t.after)}
              dragged={dragFrom === i}
              dropTarget={dropAt === i && dragFrom !== i}
              rowRef={(el) => {
                rows.current[i] = el;
              }}
              handlers={{
                onDragStart: (e) => {
                  setDragFrom(i);
                  e.dataTransfer.effectAllowed = 'move';
                  e.dataTransfer.setData('text/plain', String(i));
                },
                onDragOver: (e) => {
                  if (dragFrom === null) return;
                  e.preventDefault();
                  setDropAt(i);
                },
                onDrop: (e) => {
                  e.preventDefault();
                  if (dragFrom !== null) move(dragFrom, i);
                  setDragFrom(null);
                  setDropAt(null);
                },
                onDragEnd: () => {
                  setDragFrom(null);
                  setDropAt(null);
                },
                onKeyDown: onRowKey(i),
              }}
              onMove={(to) => move(i, to)}
              onEdit={() => setEditing(i)}
              onRemove={() => {
                onChange(removeTask(tasks, i));
                setAnnouncement(`Removed task “${t.title}”.`);
              }}
            />
          ))}
        </ol>
      )}
      <p aria-live="polite" className="sr-only">
        {announcement}
      </p>
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        {!readOnly && (
          <Button
            variant="secondary"
            onClick={() => setEditing('new')}
            disabled={nodes.worksites.length === 0}
          >
            Add task
          </Button>
        )}
        {/* under the list: the rows come first on a screen that shows the day beside them */}
        {!readOnly && (
          <p id="task-reorder-help" className="text-xs text-text-muted">
            Drag a task by its handle, use Move up and Move down, or focus a task and press Alt+↑ or Alt+↓.
          </p>
        )}
      </div>
      <Dialog
        open={editing !== null}
        title={editing === 'new' ? 'Add task' : `Edit task ${(editing ?? 0) + 1}`}
        onClose={closeForm}
        onDismiss={dismissForm}
      >
        <TaskForm
          task={typeof editing === 'number' ? tasks[editing] : undefined}
          others={otherTasks}
          nodes={nodes}
          manifest={manifest}
          flownEstimates={flownEstimates}
          onSubmit={save}
          onCancel={dismissForm}
          onDirtyChange={setFormDirty}
        />
      </Dialog>
      <ConfirmDialog
        open={askDrop}
        title="Drop the edits to this task?"
        confirmLabel="Drop the edits"
        cancelLabel="Keep editing"
        onCancel={() => setAskDrop(false)}
        onConfirm={closeForm}
      >
        <p>
          {editing === 'new'
            ? 'The new task is not added yet'
            : 'The changes to this task are not applied yet'}
          ; closing the form drops them.
        </p>
      </ConfirmDialog>
    </div>
  );
}
