import { Button } from '@/components/ui/button';
import type { PlanConflict } from '../lib/use-plan-draft';

export function ConflictNotice({ conflict, onReload }: { conflict: PlanConflict; onReload: () => void }) {
  const shown = conflict.differences.slice(0, 8);
  return (
    <div
      role="alert"
      className="space-y-2 rounded-md border border-danger/40 bg-danger-soft px-4 py-3 text-sm text-danger"
    >
      <p className="font-semibold">
        Someone else changed this plan (now version {conflict.version}
        {conflict.changedBy ? ` by ${conflict.changedBy}` : ''}). Your changes were not saved, and nothing of
        theirs was overwritten.
      </p>
      {shown.length > 0 ? (
        <>
          <p className="text-text">Where their plan differs from your copy (yours → theirs):</p>
          <ul className="list-disc pl-5 text-text">
            {shown.map((d) => (
              <li key={d}>{d}</li>
            ))}
            {conflict.differences.length > shown.length && (
              <li>and {conflict.differences.length - shown.length} more</li>
            )}
          </ul>
        </>
      ) : (
        <p className="text-text">Their plan has the same content as your copy.</p>
      )}
      <Button variant="danger" size="sm" onClick={onReload}>
        Reload
      </Button>
    </div>
  );
}
