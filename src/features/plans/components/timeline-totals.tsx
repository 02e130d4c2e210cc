import type { CrewMember } from '@shared/schemas/plan';
import { formatElapsed, formatGmt } from '@shared/compute/units';
import { Table, Td, Th } from '@/components/ui/table';
import type { PlanTimeline } from '../types';

const CREW: CrewMember[] = ['EV1', 'EV2'];

export function TimelineTotals({
  timeline,
  names,
  startGmt,
}: {
  timeline: PlanTimeline;
  names: Record<CrewMember, string>;
  startGmt?: string | null;
}) {
  const over = timeline.marginSeconds < 0;
  return (
    <div className="space-y-3">
      <Table caption="Totals per crew member">
        <thead>
          <tr>
            <Th>Crew</Th>
            <Th>Work</Th>
            <Th>Translate</Th>
            <Th>Tether swaps</Th>
            <Th>Idle</Th>
            <Th>Back inside</Th>
          </tr>
        </thead>
        <tbody>
          {CREW.map((m) => {
            const c = timeline.crew[m];
            return (
              <tr key={m}>
                <Td className="font-medium text-text-strong">
                  {m} <span className="font-normal text-text-muted">{names[m]}</span>
                </Td>
                <Td>{formatElapsed(c.workSeconds)}</Td>
                <Td>{formatElapsed(c.translateSeconds)}</Td>
                <Td>
                  {c.swapCount} ({formatElapsed(c.swapSeconds)})
                </Td>
                <Td>{formatElapsed(c.idleSeconds)}</Td>
                <Td>{formatElapsed(c.totalSeconds)}</Td>
              </tr>
            );
          })}
        </tbody>
      </Table>
      <p className="text-sm" data-testid="timeline-margin">
        {startGmt && <>Starts at {formatGmt(startGmt, 0)} GMT. </>}
        Day ends at <strong>{formatElapsed(timeline.endSeconds)}</strong> elapsed
        {startGmt && ` (${formatGmt(startGmt, timeline.endSeconds)} GMT)`} against a limit of{' '}
        {formatElapsed(timeline.timeLimitSeconds)}:{' '}
        {over ? (
          <strong className="text-danger">
            <span aria-hidden="true">⚠ </span>
            {formatElapsed(-timeline.marginSeconds)} over the limit
          </strong>
        ) : (
          <strong className="text-status-approved">
            <span aria-hidden="true">✓ </span>
            {formatElapsed(timeline.marginSeconds)} margin
          </strong>
        )}
        . Orbit: period {formatElapsed(timeline.orbit.periodSeconds)}, night{' '}
        {formatElapsed(timeline.orbit.eclipseSeconds)} per orbit at beta {timeline.orbit.betaDeg}°.
      </p>
    </div>
  );
}
