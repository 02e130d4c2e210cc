import { useEffect, useRef } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button, focusRing } from '@/components/ui/button';
import { PlanningCaution } from '@/components/ui/planning-caution';
import { Spinner } from '@/components/ui/spinner';
import { apiErrorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import type { RouteFinder } from '../lib/use-route-finder';
import { ModeComparisonTable } from './mode-comparison-table';
import { RouteFeasibleView, RouteInfeasibleView } from './route-result';
import { RouteFinderForm } from './route-finder-form';

interface RouteFinderPanelProps {
  finder: RouteFinder;
  /** the screen's selection: while picking, a node newly selected (a click in 3D) fills the field */
  selection?: { type: string; key: string } | null;
  onFocusNode?: (key: string) => void;
}

/** The route finder's form, its result in the chosen mode and the three modes compared. */
export function RouteFinderPanel({ finder, selection, onFocusNode }: RouteFinderPanelProps) {
  const { station, submitted, chosen, route, comparison, picking } = finder;
  if (!station) return <Spinner label="Loading the station" />;
  const unit = submitted?.unit ?? 'm';
  return (
    <div className="space-y-5">
      {selection !== undefined && (
        <SelectionPick selection={selection} picking={picking !== null} onNode={finder.selectNode} />
      )}
      <RouteFinderForm
        options={finder.nodeOptions()}
        defaults={finder.defaults}
        picking={picking}
        onTogglePick={finder.togglePick}
        picked={finder.picked}
        onPickApplied={finder.clearPicked}
        mode={submitted?.mode}
        isFetching={comparison.isFetching}
        onModeChange={(mode) => submitted && finder.chooseMode(mode)}
        onSubmit={finder.submit}
      />
      {picking && (
        <p role="status" className="text-sm text-accent-strong">
          Click a node in the 3D view to fill {picking === 'from' ? 'From' : 'To'}.
        </p>
      )}
      {submitted && (
        <section aria-label="Route result" className="space-y-4 border-t border-surface-line pt-4">
          {chosen?.isPending && <Spinner label="Computing the route" />}
          {chosen?.error && (
            <Alert tone="danger">{apiErrorMessage(chosen.error, 'The route could not be computed.')}</Alert>
          )}
          {route?.feasible === false && <RouteInfeasibleView route={route} unit={unit} />}
          {route?.feasible && (
            <>
              <label className="flex items-center gap-2 text-sm text-text-strong">
                <input
                  type="checkbox"
                  checked={finder.showReach}
                  onChange={(e) => finder.setShowReach(e.target.checked)}
                  className={cn('accent-accent', focusRing)}
                />
                Show tether reach in 3D (a sphere of the tether length at each clip point)
              </label>
              <RouteFeasibleView route={route} unit={unit} onFocusNode={onFocusNode} />
            </>
          )}
          <div className="space-y-2">
            <h3 className="text-sm font-semibold text-text-strong">Modes compared</h3>
            <ModeComparisonTable
              results={Object.fromEntries(Object.entries(comparison.byMode).map(([m, q]) => [m, q.data]))}
              chosen={submitted.mode}
              unit={unit}
              onChoose={finder.chooseMode}
            />
          </div>
          <Button variant="secondary" size="sm" onClick={finder.clear}>
            Clear route
          </Button>
          <PlanningCaution />
        </section>
      )}
    </div>
  );
}

/** While picking, a node newly selected on the screen (a click in 3D) fills the field. */
function SelectionPick({
  selection,
  picking,
  onNode,
}: {
  selection: { type: string; key: string } | null;
  picking: boolean;
  onNode: (key: string) => boolean;
}) {
  const key = selection?.type === 'node' ? selection.key : null;
  const seen = useRef(key);
  useEffect(() => {
    if (key === seen.current) return;
    seen.current = key;
    if (picking && key) onNode(key);
  }, [key, picking, onNode]);
  return null;
}
