import { formatLength, type LengthUnit } from '@shared/compute/units';
import { Table, Td, Th } from '@/components/ui/table';
import type { AssignmentRow } from '../lib/planned-sockets';

const deg = (v: number | null) => (v === null ? '–' : `${v.toFixed(1)}°`);
const setDeg = (v: number | null) => (v === null ? '–' : `${Math.round(v)}°`);

export function SocketPlanTable({ rows, unit }: { rows: readonly AssignmentRow[]; unit: LengthUnit }) {
  return (
    <Table caption="Each target, the socket that serves it, the distance from the work point and the restraint angles">
      <thead>
        <tr>
          <Th>Target</Th>
          <Th>Socket</Th>
          <Th className="text-right">Distance from work point</Th>
          <Th>Reachable</Th>
          <Th className="text-right">Yaw (raw / set)</Th>
          <Th className="text-right">Pitch (raw / set)</Th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.target}>
            <Td className="font-medium text-text-strong">{r.targetLabel}</Td>
            <Td className="font-mono">{r.socketName ?? 'none reaches it'}</Td>
            <Td className="text-right tabular-nums">
              {r.distanceM === null ? '–' : formatLength(r.distanceM, unit, 2)}
            </Td>
            <Td className={r.reachable ? 'text-status-approved' : 'font-semibold text-danger'}>
              {r.reachable ? 'Yes' : 'No'}
            </Td>
            <Td className="text-right tabular-nums">
              {deg(r.yawDeg)} / <span className="font-semibold">{setDeg(r.yawSetDeg)}</span>
            </Td>
            <Td className="text-right tabular-nums">
              {deg(r.pitchDeg)} / <span className="font-semibold">{setDeg(r.pitchSetDeg)}</span>
            </Td>
          </tr>
        ))}
      </tbody>
    </Table>
  );
}
