import { useState } from 'react';
import type { Arm } from '@shared/schemas/station';
import type { StationEdit } from '../api/edit-station';
import { ArmForm } from './arm-form';
import { KeyedRow } from './keyed-row';

interface ArmsEditorProps {
  arms: readonly Arm[];
  isNode: (key: string) => boolean;
  /** a new arm's base: the selected node, if any */
  selectedKey: string | null;
  /** changes after the arms' own saved change or a reload: the form then starts afresh */
  formKey: string;
  isSaving: boolean;
  onSubmit: (edit: StationEdit) => void;
}

/** The station's robotic arms: the list, and a form to add one or change the one picked. */
export function ArmsEditor({ arms, isNode, selectedKey, formKey, isSaving, onSubmit }: ArmsEditorProps) {
  const [editing, setEditing] = useState<string | null>(null);
  const current = arms.find((a) => a.key === editing);
  // the arms travel as a whole list: each change sends the list as it would be
  const send = (next: Arm[], what: string) => {
    setEditing(null);
    onSubmit({ type: 'set-arms', arms: next, what });
  };
  return (
    <>
      {arms.length > 0 && (
        <ul className="divide-y divide-surface-line text-sm" aria-label="Arms">
          {arms.map((a) => (
            <KeyedRow
              key={a.key}
              noun="arm"
              itemKey={a.key}
              removeWord="Remove"
              isSaving={isSaving}
              onChange={() => setEditing(a.key)}
              onRemove={() =>
                send(
                  arms.filter((x) => x.key !== a.key),
                  `remove arm ${a.key}`,
                )
              }
            >
              <span className="text-xs text-text-muted">
                on {a.baseNode}, {a.minReachM ?? 0}–{a.reachM} m
              </span>
            </KeyedRow>
          ))}
        </ul>
      )}
      <h4 className="text-sm font-semibold text-text-strong">
        {current ? `Change ${current.key}` : 'Add an arm'}
      </h4>
      <ArmForm
        key={`${editing ?? 'new'}@${formKey}`}
        arm={current}
        others={arms.filter((a) => a.key !== editing)}
        isNode={isNode}
        baseNode={selectedKey ?? ''}
        isSaving={isSaving}
        onSubmit={(arm) =>
          current
            ? send(
                arms.map((a) => (a.key === current.key ? arm : a)),
                `change arm ${arm.key}`,
              )
            : send([...arms, arm], `add arm ${arm.key}`)
        }
        onCancel={current ? () => setEditing(null) : undefined}
      />
    </>
  );
}
