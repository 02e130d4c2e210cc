import { armTipAtTime } from '@shared/compute/arm';
import type { ArmLane, EquipmentTrack, ItemWhere } from '@shared/compute/day/types';
import { itemStateAt, stepAt } from '@shared/compute/walkthrough';
import { useClock, type PlaybackClock } from '../lib/playback-clock';
import type { Lane } from '../lib/playback-model';
import { ITEM_STYLE, LANE_STYLES } from './lane-styles';

/** Where an item is, in a few words, and as a data value tests and tools can read. */
export function whereText(
  where: ItemWhere,
  /** the station's arm keys: an item installed "at" one is on that arm's end */
  arms: ReadonlySet<string> = new Set(),
): { text: string; value: string } {
  switch (where.kind) {
    case 'airlock':
      return { text: 'in the airlock', value: 'airlock' };
    case 'carried':
      return { text: `held by ${where.crew}`, value: `carried:${where.crew}` };
    case 'at':
      return { text: `set down at ${where.node}`, value: `at:${where.node}` };
    case 'installed':
      return {
        text: arms.has(where.node) ? `installed on the end of ${where.node}` : `installed at ${where.node}`,
        value: `installed:${where.node}`,
      };
  }
}

/** What an arm is doing at `t`, in words, and its tip rounded to the centimetre (for tests and tools). */
export function armStateAt(arm: ArmLane, t: number): { text: string; rider: string; tip: string } {
  const move = arm.blocks.find((b) => b.start <= t && t < b.end);
  const session = arm.sessions.find((x) => x.start <= t && t < x.end);
  const last = [...arm.blocks].reverse().find((b) => b.end <= t);
  const at = last?.to ?? arm.sessions[0]?.ingress ?? '—';
  const tip = armTipAtTime(arm, t);
  return {
    text: move ? move.label : `${arm.key} at ${at}${session ? `, ${session.rider} on it` : ', nobody on it'}`,
    rider: session?.rider ?? '',
    tip: tip ? tip.map((v) => v.toFixed(2)).join(',') : '',
  };
}

const RESTRAINT_STEPS = new Set(['restraint-in', 'work', 'restraint-out']);

/**
 * The state of the day at the clock's time, in words: each crew member's step, tether anchor and
 * foot restraint, and where every item is. It re-renders only when one of those changes.
 */
export function DayState({
  clock,
  lanes,
  equipment,
  arms = [],
}: {
  clock: PlaybackClock;
  lanes: readonly Lane[];
  equipment: readonly EquipmentTrack[];
  /** the arms the day uses: who rides each and where its tip is */
  arms?: readonly ArmLane[];
}) {
  const armKeys = new Set(arms.map((a) => a.key));
  // one string per moment that differs: the steps under way and each item's state
  const key = useClock(
    clock,
    (c) =>
      `${lanes.map((l) => stepAt(l.track.steps, c.t)).join(',')}|${equipment
        .map((e) => whereText(itemStateAt(e, c.t).where).value)
        .join(',')}|${arms.map((a) => armStateAt(a, c.t).tip).join(';')}`,
  );
  const [stepPart, itemPart] = key.split('|');
  const steps = stepPart.split(',').map(Number);
  const wheres = itemPart ? itemPart.split(',') : [];
  return (
    <div className="space-y-3 text-sm" data-testid="day-state">
      <ul className="space-y-2">
        {lanes.map((lane, i) => {
          const step = lane.track.steps[steps[i]];
          const restraint = step && RESTRAINT_STEPS.has(step.type) ? step.socketKey : undefined;
          const holding = equipment.filter((_, k) => wheres[k] === `carried:${lane.id}`).map((e) => e.name);
          return (
            <li
              key={lane.id}
              data-testid={`day-crew-${lane.id}`}
              data-anchor={step?.anchorKey ?? ''}
              data-restraint={restraint ?? ''}
              data-step={step?.type ?? ''}
              className="rounded-md border border-surface-line px-3 py-2"
            >
              <p className="font-semibold text-text-strong">
                <span aria-hidden="true" style={{ color: LANE_STYLES[lane.id].color }}>
                  {LANE_STYLES[lane.id].glyph}
                </span>{' '}
                {lane.label}: {step?.title ?? '—'}
              </p>
              <p className="text-text">
                Tether clipped at <span className="font-mono">{step?.anchorKey ?? '—'}</span>
                {restraint ? (
                  <>
                    {' '}
                    · in the foot restraint on <span className="font-mono">{restraint}</span>
                  </>
                ) : null}
              </p>
              <p className="text-text-muted">Holding: {holding.length ? holding.join(', ') : 'nothing'}</p>
            </li>
          );
        })}
      </ul>
      {arms.length > 0 && (
        <ul className="space-y-1" aria-label="Arms at this moment">
          {arms.map((arm) => {
            const state = armStateAt(arm, clock.t);
            return (
              <li
                key={arm.key}
                data-testid={`day-arm-${arm.key}`}
                data-rider={state.rider}
                data-tip={state.tip}
                className="rounded-md border border-surface-line px-3 py-1.5 text-text"
              >
                {state.text}
              </li>
            );
          })}
        </ul>
      )}
      {equipment.length > 0 && (
        <table className="w-full text-left text-xs">
          <caption className="mb-1 text-left text-sm font-semibold text-text-strong">
            Items at this moment
          </caption>
          <tbody>
            {equipment.map((e, k) => {
              const where = itemStateAt(e, clock.t).where;
              return (
                <tr key={e.item} data-testid={`day-item-${e.item}`} data-where={wheres[k]}>
                  <th scope="row" className="py-0.5 pr-2 font-medium text-text-strong">
                    <span aria-hidden="true" style={{ color: ITEM_STYLE.colors[e.kind] }}>
                      ●
                    </span>{' '}
                    {e.name}
                  </th>
                  <td className="py-0.5 text-text">{whereText(where, armKeys).text}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
    </div>
  );
}
