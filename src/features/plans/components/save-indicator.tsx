import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import type { SaveState } from '../lib/use-plan-draft';

const TEXT: Record<SaveState, { mark: string; text: string; tone: string }> = {
  saved: { mark: '✓', text: 'All changes saved', tone: 'text-status-approved' },
  unsaved: { mark: '●', text: 'Unsaved changes', tone: 'text-caution' },
  saving: { mark: '', text: 'Saving…', tone: 'text-text-muted' },
  invalid: { mark: '⚠', text: 'Not saved: fix the marked fields', tone: 'text-danger' },
  conflict: { mark: '⚠', text: 'Not saved: changed elsewhere', tone: 'text-danger' },
  error: { mark: '⚠', text: 'Not saved', tone: 'text-danger' },
};

export function SaveIndicator({
  state,
  version,
  invalidCount = 0,
  onSave,
}: {
  state: SaveState;
  version: number;
  /** fields to fix before the plan can be saved */
  invalidCount?: number;
  onSave: () => void;
}) {
  const t =
    state === 'invalid' && invalidCount > 0
      ? {
          ...TEXT.invalid,
          text: `Not saved: fix ${invalidCount} field${invalidCount === 1 ? '' : 's'}`,
        }
      : TEXT[state];
  return (
    <div className="flex items-center gap-3">
      <p
        role="status"
        aria-live="polite"
        className={`flex items-center gap-1.5 text-sm font-medium ${t.tone}`}
        data-save-state={state}
      >
        {state === 'saving' ? <Spinner size="sm" label="" /> : <span aria-hidden="true">{t.mark}</span>}
        {t.text}
        <span className="font-normal text-text-muted">· version {version}</span>
      </p>
      {(state === 'unsaved' || state === 'error') && (
        <Button size="sm" variant="secondary" onClick={onSave}>
          Save now
        </Button>
      )}
    </div>
  );
}
