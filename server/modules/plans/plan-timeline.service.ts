import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { computeTimeline } from '@shared/compute/timeline';
import { checkInventory } from '@shared/compute/inventory';
import { getCompiledStation } from '../compute/compiled-cache';
import { routeOffPath } from '../compute/clip-builder';
import { reachOn } from '../compute/compute.service';
import { PLANNING_CAUTION, getPlan, type PlanView } from './plans.service';

export type { PlanTimeline, ReachWarning, TaskReach } from '@shared/schemas/plan-views';
import type { PlanTimeline, ReachWarning, TaskReach } from '@shared/schemas/plan-views';

/**
 * The plan's day on its station's current version: routes from the compiled cache in the plan's
 * mode, each crew member's tether and the task's carrying flag; inventory and foot-restraint reach
 * checked alongside.
 */
export function planTimeline(ctx: AppContext, planId: number): { plan: PlanView; timeline: PlanTimeline } {
  const plan = getPlan(ctx.db, planId);
  const { doc, compiled, version } = getCompiledStation(ctx, plan.stationId);
  const airlock = doc.nodes.find((n) => n.kind === 'airlock');
  if (!airlock)
    throw badRequest(`The station "${doc.name}" has no airlock, so no EVA day can be laid out on it.`);
  const hasNode = (key: string) => compiled.keyToIndex.has(key);
  const timeline = computeTimeline(
    { plan, airlockKey: airlock.key, orbit: doc.orbit, hasNode },
    (from, to, options) => routeOffPath(compiled, doc, { from, to, ...options }),
  );
  const inventoryWarnings = checkInventory(plan.manifest, plan.tasks, { airlockKey: airlock.key, hasNode });

  const byKey = new Map(doc.nodes.map((n) => [n.key, n]));
  const sockets = doc.nodes.filter((n) => n.kind === 'socket' && n.normal);
  const reach: TaskReach[] = [];
  const reachWarnings: ReachWarning[] = [];
  plan.tasks.forEach((task, taskIndex) => {
    if (!task.socket) return;
    const site = byKey.get(task.worksite);
    const socket = byKey.get(task.socket);
    const name = `Task ${taskIndex + 1} "${task.title}"`;
    if (!site || socket?.kind !== 'socket') {
      reach.push({ taskIndex, socket: task.socket, worksite: task.worksite, reach: null });
      reachWarnings.push({
        code: 'socket-unusable',
        message: `${name}: ${!site ? `the station has no worksite "${task.worksite}"` : `"${task.socket}" is not a foot-restraint socket of the station`}`,
        taskIndex,
      });
      return;
    }
    const result = reachOn(doc, { socket: task.socket, target: site.position });
    reach.push({ taskIndex, socket: task.socket, worksite: task.worksite, reach: result });
    if (result.reachable) return;
    const reachingSockets = sockets
      .map((s) => ({ key: s.key, r: reachOn(doc, { socket: s.key, target: site.position }) }))
      .filter((x) => x.r.reachable)
      .sort((a, b) => a.r.distanceM - b.r.distanceM)
      .map((x) => x.key);
    const others = reachingSockets.length
      ? `; ${reachingSockets.slice(0, 3).join(', ')} would reach it`
      : '; no socket of the station reaches it (run the socket planner)';
    reachWarnings.push({
      code: 'socket-out-of-reach',
      message: `${name}: from socket ${task.socket} the worksite ${task.worksite} is ${(result.distanceM - result.radiusM).toFixed(2)} m beyond reach${others}`,
      taskIndex,
      reachingSockets,
    });
  });

  return {
    plan,
    timeline: {
      ...timeline,
      planId: plan.id,
      planVersion: plan.version,
      stationId: plan.stationId,
      stationVersion: version,
      airlockKey: airlock.key,
      inventoryWarnings,
      reach,
      reachWarnings,
      caution: PLANNING_CAUTION,
    },
  };
}
