import { useState } from 'react';
import type { GraphEdge } from '@shared/schemas/station-edits';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { describeEdge, edgesOfNode } from '../utils/node-keys';

interface DeleteNodeButtonProps {
  nodeKey: string;
  edges: readonly GraphEdge[];
  isSaving: boolean;
  onConfirm: () => void;
}

export function DeleteNodeButton({ nodeKey, edges, isSaving, onConfirm }: DeleteNodeButtonProps) {
  const [open, setOpen] = useState(false);
  const going = edgesOfNode(edges, nodeKey);
  return (
    <>
      <Button variant="danger" size="sm" onClick={() => setOpen(true)}>
        Delete node…
      </Button>
      <Dialog open={open} title={`Delete node ${nodeKey}?`} onClose={() => setOpen(false)}>
        <div className="space-y-3 text-sm">
          {going.length ? (
            <>
              <p>{going.length === 1 ? 'This edge goes' : `These ${going.length} edges go`} with it:</p>
              <ul className="max-h-48 list-disc overflow-y-auto pl-5 font-mono text-xs">
                {going.map((e) => (
                  <li key={e.id}>{describeEdge(e)}</li>
                ))}
              </ul>
            </>
          ) : (
            <p>It has no edges.</p>
          )}
          <p className="text-text-muted">Plans that name this node will report it as unknown.</p>
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              isLoading={isSaving}
              onClick={() => {
                onConfirm();
                setOpen(false);
              }}
            >
              Delete {nodeKey}
              {going.length ? ` and ${going.length} edge${going.length === 1 ? '' : 's'}` : ''}
            </Button>
          </div>
        </div>
      </Dialog>
    </>
  );
}
