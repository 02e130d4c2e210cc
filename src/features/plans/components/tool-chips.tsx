import { useId, useState } from 'react';
import type { ManifestItem, TaskCrew } from '@shared/schemas/plan';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { newManifestItem } from '../lib/task-form-schema';
import { ToggleChip } from './toggle-chip';

interface ToolChipsProps {
  /** item keys (or, from older plans, names no item answers to) */
  value: string[];
  onChange: (tools: string[]) => void;
  /** the manifest with the items this form added */
  manifest: readonly ManifestItem[];
  crew: TaskCrew;
  /** an item named here goes on the manifest (when the task is applied) */
  onAddItem: (item: ManifestItem) => void;
  error?: string;
}

/** What a task needs at hand: chips of the manifest's items, and a new one added inline. */
export function ToolChips({ value, onChange, manifest, crew, onAddItem, error }: ToolChipsProps) {
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string>();
  const inputId = useId();
  const errorId = useId();
  const keyed = manifest.filter((m): m is ManifestItem & { key: string } => !!m.key);
  const unknown = value.filter((t) => !keyed.some((m) => m.key === t));
  const toggle = (key: string) =>
    onChange(value.includes(key) ? value.filter((t) => t !== key) : [...value, key]);

  const add = () => {
    const made = newManifestItem(name, crew, manifest);
    if ('error' in made) return setNameError(made.error);
    onAddItem(made.item);
    onChange([...value, made.item.key!]);
    setName('');
    setNameError(undefined);
  };

  const chip = (key: string, label: string, missing: boolean) => (
    <ToggleChip key={key} on={value.includes(key)} onToggle={() => toggle(key)}>
      {label}
      {missing && <span className="ml-1 text-danger">(not in manifest)</span>}
    </ToggleChip>
  );

  return (
    <fieldset className="space-y-2">
      <legend className="mb-1.5 text-sm font-medium text-text-strong">Needed at hand</legend>
      {keyed.length === 0 && unknown.length === 0 ? (
        <p className="text-sm text-text-muted">The manifest is empty: add a tool below.</p>
      ) : (
        <div className="flex flex-wrap gap-2" role="group" aria-label="Manifest items">
          {keyed.map((m) => chip(m.key, m.name, false))}
          {unknown.map((t) => chip(t, t, true))}
        </div>
      )}
      <div className="flex items-start gap-2">
        <div className="flex-1">
          <label htmlFor={inputId} className="sr-only">
            New tool for the manifest
          </label>
          <Input
            id={inputId}
            value={name}
            placeholder="Add new: a tool's name"
            autoComplete="off"
            aria-invalid={nameError ? true : undefined}
            aria-describedby={nameError ? errorId : undefined}
            onChange={(e) => setName(e.target.value)}
            onKeyDown={(e) => {
              if (e.key !== 'Enter') return;
              e.preventDefault();
              add();
            }}
          />
          <p id={errorId} className="mt-1 text-sm text-danger empty:hidden" aria-live="polite">
            {nameError}
          </p>
        </div>
        <Button variant="secondary" onClick={add}>
          Add to manifest
        </Button>
      </div>
      <p className="text-xs text-text-muted">
        A new tool goes on the manifest as carried out by {crew === 'both' ? 'EV1' : crew} when you apply the
        task.
      </p>
      {error && <p className="text-sm text-danger">{error}</p>}
    </fieldset>
  );
}
