import { toCsv } from '../../lib/csv';
import { buildCueCardPdf, type CueCardDocument, type CueStep } from '../../lib/pdf';
import { formatElapsed, formatGmt } from '@shared/compute/units';
import type { TimelineBlock } from '@shared/compute/day/types';
import { describeAction, tetherAfterBlocks } from '@shared/compute/day/describe';
import type { PlanView } from './plans.service';
import type { PlanTimeline } from './plan-timeline.service';

export const CSV_HEADER = [
  'crew',
  'type',
  'start',
  'end',
  'duration_min',
  'task',
  'from',
  'to',
  'swaps',
  'socket',
  'tether_anchor',
  'tether_out_m',
  'equipment',
  'notes',
  'start_gmt',
  'end_gmt',
];

/** What the crew member does with items in this block: the task's actions, on its work block. */
function equipmentSteps(plan: PlanView, block: TimelineBlock, member: 'EV1' | 'EV2'): string[] {
  if (block.type !== 'work' || block.taskIndex === undefined) return [];
  const task = plan.tasks[block.taskIndex];
  return task.actions
    .filter((a) => task.crew !== 'both' || a.by === member)
    .map((a) =>
      describeAction(
        task,
        a,
        plan.manifest.map((m, i) => ({ key: m.key ?? `item-${i + 1}`, name: m.name, kind: m.kind })),
      ),
    );
}

function blockNotes(block: TimelineBlock, member: 'EV1' | 'EV2'): string {
  const notes: string[] = [];
  if (block.type === 'wait' || block.type === 'translate') notes.push(block.label);
  if (block.arm) notes.push(armStepText(block, member));
  if (block.type === 'swap' && block.swapNode)
    notes.push(
      `clip the new hook at ${block.swapNode}, then release the old one at ${block.releaseNode ?? '?'}`,
    );
  if (block.unreached) notes.push('worksite not reached: see the plan warnings');
  return notes.join('; ');
}

/**
 * An arm step in a cue card's words: "ARM-1 carries EV1 to PB3-W02, 2:10" (the time is how long the
 * move takes, h:mm), getting on and off with the tether's change of anchor.
 */
export function armStepText(b: TimelineBlock, member: 'EV1' | 'EV2'): string {
  const took = formatElapsed(b.end - b.start);
  if (b.type === 'arm-ride') return `${b.arm} carries ${member} to ${b.to}, ${took}`;
  if (b.type === 'restraint-in')
    return `${member} gets onto ${b.arm}'s foot restraint at ${b.to}, tether from ${b.tetherAtStart?.anchor} to the arm, ${took}`;
  if (b.type === 'restraint-out')
    return `${member} gets off ${b.arm} at ${b.to} and clips the tether there, ${took}`;
  return b.label;
}

/** One row per timeline block, both crew members, in time order within each. */
export function timelineCsv(plan: PlanView, timeline: PlanTimeline): string {
  const rows: (string | number)[][] = [];
  const gmt = (seconds: number) => (plan.startGmt ? formatGmt(plan.startGmt, seconds) : '');
  for (const member of ['EV1', 'EV2'] as const) {
    const blocks = timeline.crew[member].blocks;
    const tethers = tetherAfterBlocks(blocks, timeline.airlockKey);
    blocks.forEach((b, k) => {
      const task = b.taskIndex === undefined ? undefined : plan.tasks[b.taskIndex];
      rows.push([
        `${member} ${plan.crew[member].name}`,
        b.type,
        formatElapsed(b.start),
        formatElapsed(b.end),
        Math.round(((b.end - b.start) / 60) * 10) / 10,
        task?.title ?? '',
        b.from ?? '',
        b.to ?? '',
        b.type === 'swap' ? (b.swapNode ?? '') : '',
        b.socket ?? '',
        tethers[k].anchor,
        Math.round(tethers[k].paidOutM * 10) / 10,
        equipmentSteps(plan, b, member).join('; '),
        blockNotes(b, member),
        gmt(b.start),
        gmt(b.end),
      ]);
    });
  }
  // CRLF per RFC 4180; a typed title starting with = + - @ must not run as a spreadsheet formula
  return toCsv(CSV_HEADER, rows);
}

/** A file name from the plan title: letters, digits and dashes only. */
export function exportFileName(plan: PlanView, ext: string): string {
  const slug =
    plan.title
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 60) || 'plan';
  return `${slug}-v${plan.version}.${ext}`;
}

const overlapsNight = (b: { start: number; end: number }, nights: PlanTimeline['nightWindows']) =>
  nights.some((w) => b.start < w.end && b.end > w.start);

/** The station notes at each block of a crew member's day, as cue-card lines, by block index. */
function noteLines(timeline: PlanTimeline, member: 'EV1' | 'EV2'): Map<number, string[]> {
  const out = new Map<number, string[]>();
  for (const n of timeline.stationNotes ?? [])
    for (const p of n.places)
      if (p.crew === member)
        out.set(p.block, [...(out.get(p.block) ?? []), `NOTE at ${n.nodeKey}: ${n.title}`]);
  return out;
}

function withNotes(step: CueStep, lines: string[] | undefined): CueStep {
  return lines ? { ...step, details: [...(step.details ?? []), ...lines] } : step;
}

function cueStep(plan: PlanView, b: TimelineBlock, timeline: PlanTimeline, member: 'EV1' | 'EV2'): CueStep {
  const night = overlapsNight(b, timeline.nightWindows);
  const base = { start: b.start, end: b.end, kind: b.type, night };
  const route = b.routeIndex === undefined ? undefined : timeline.routes[b.routeIndex];
  if (b.type === 'translate' && route) {
    const legs = route.legs.slice(b.legStart ?? 0, b.legEnd ?? route.legs.length);
    const metres = legs.reduce((s, l) => s + l.lengthM, 0);
    const via =
      legs.length > 1
        ? [
            `via ${legs
              .slice(0, -1)
              .map((l) => l.to)
              .join(', ')}`,
          ]
        : [];
    const tether = b.tetherAtEnd
      ? [`clipped at ${b.tetherAtEnd.anchor}, ${b.tetherAtEnd.paidOutM.toFixed(1)} m out on arrival`]
      : [];
    return {
      ...base,
      text: `Translate ${b.from} → ${b.to}, ${metres.toFixed(1)} m`,
      details: [...via, ...tether],
    };
  }
  if (b.type === 'swap' && b.swapNode) {
    return {
      ...base,
      text: `Tether swap at ${b.swapNode}: clip the new hook at ${b.swapNode}, then release the old one at ${b.releaseNode ?? '?'}`,
      details: b.paidOutM === undefined ? [] : [`${b.paidOutM.toFixed(1)} m paid out before the swap`],
    };
  }
  if (b.arm && b.type !== 'work' && b.type !== 'wait') {
    return { ...base, text: armStepText(b, member) };
  }
  if (b.type === 'restraint-in' && b.socket) {
    return {
      ...base,
      text: `Into the foot restraint on ${b.socket}`,
      details: b.yawSetDeg === undefined ? [] : [`set yaw ${b.yawSetDeg}°, pitch ${b.pitchSetDeg}°`],
    };
  }
  if (b.type === 'work' && b.taskIndex !== undefined) {
    const task = plan.tasks[b.taskIndex];
    const details = [
      `at ${task.worksite}${b.socket ? `, from the foot restraint on ${b.socket}` : ''}`,
      ...(task.tools.length ? [`tools: ${task.tools.join(', ')}`] : []),
      ...equipmentSteps(plan, b, member),
      ...(task.eclipseOnly ? ['ECLIPSE ONLY: do this in orbital night'] : []),
      ...(b.unreached ? ['worksite not reached by the plan: see the warnings'] : []),
      ...(task.notes ? [task.notes] : []),
    ];
    return { ...base, text: task.title, details };
  }
  return { ...base, text: b.label };
}

/** A route with more tether swaps than this is one cue step (its swap points listed in order). */
export const CUE_SWAPS_SPELLED_OUT = 4;

/**
 * A crew member's cue steps: a step per block, except that a route with more than
 * `CUE_SWAPS_SPELLED_OUT` swaps is one step, "Translate A → B, 812.0 m, 31 tether swaps", with its
 * swap points in order and the tether on arrival (a step per swap made a long day's cards run to
 * thousands of lines that no one reads on the day, and its PDF to minutes).
 */
function cueSteps(
  plan: PlanView,
  timeline: PlanTimeline,
  member: 'EV1' | 'EV2',
  notes: Map<number, string[]>,
): CueStep[] {
  const blocks = timeline.crew[member].blocks;
  const steps: CueStep[] = [];
  const onRoute = (b: TimelineBlock, routeIndex: number) =>
    (b.type === 'translate' || b.type === 'swap') && b.routeIndex === routeIndex;
  for (let k = 0; k < blocks.length; k++) {
    const b = blocks[k];
    const routeIndex = b.routeIndex;
    if (b.type !== 'translate' || routeIndex === undefined) {
      steps.push(withNotes(cueStep(plan, b, timeline, member), notes.get(k)));
      continue;
    }
    let end = k + 1;
    while (end < blocks.length && onRoute(blocks[end], routeIndex)) end++;
    const run = blocks.slice(k, end);
    const swaps = run.filter((r) => r.type === 'swap');
    if (swaps.length <= CUE_SWAPS_SPELLED_OUT) {
      steps.push(withNotes(cueStep(plan, b, timeline, member), notes.get(k)));
      continue;
    }
    const moves = run.filter((r) => r.type === 'translate');
    const metres = moves.reduce((sum, m) => {
      const legs = timeline.routes[routeIndex].legs.slice(m.legStart ?? 0, m.legEnd ?? 0);
      return sum + legs.reduce((s2, l) => s2 + l.lengthM, 0);
    }, 0);
    const last = moves[moves.length - 1];
    const step: CueStep = {
      start: b.start,
      end: run[run.length - 1].end,
      kind: 'translate',
      night: run.some((r) => overlapsNight(r, timeline.nightWindows)),
      text: `Translate ${b.from} → ${last.to}, ${metres.toFixed(1)} m, ${swaps.length} tether swaps`,
      details: [
        `swaps at ${swaps.map((w) => w.swapNode).join(', ')}`,
        ...(last.tetherAtEnd
          ? [
              `clipped at ${last.tetherAtEnd.anchor}, ${last.tetherAtEnd.paidOutM.toFixed(1)} m out on arrival`,
            ]
          : []),
      ],
    };
    const runNotes = run.flatMap((_, i) => notes.get(k + i) ?? []);
    steps.push(withNotes(step, runNotes.length ? runNotes : undefined));
    k = end - 1;
  }
  return steps;
}

/** The cue-card model of the plan's timeline: one card per crew member. */
export function cueCardDocument(plan: PlanView, timeline: PlanTimeline): CueCardDocument {
  const cards = (['EV1', 'EV2'] as const).map((member) => {
    const tools = plan.manifest
      .filter((m) => m.carriedBy === member && m.startsAt === 'airlock' && !m.installedAt)
      .map((m) => (m.quantity > 1 ? `${m.name} ×${m.quantity}` : m.name));
    const notes = noteLines(timeline, member);
    return {
      member,
      name: plan.crew[member].name,
      tetherLengthM: plan.crew[member].tetherLengthM,
      tools,
      steps: cueSteps(plan, timeline, member, notes),
    };
  });
  const start = plan.startGmt;
  return {
    title: plan.title,
    subtitle: `${plan.stationName} · ${plan.date}${start ? ` · starts ${formatGmt(start, 0)} GMT` : ''} · ${plan.status} · version ${plan.version} · ends ${formatElapsed(timeline.endSeconds)} of ${formatElapsed(timeline.timeLimitSeconds)}`,
    caution: timeline.caution,
    cards,
    nightWindows: timeline.nightWindows,
    warnings: timeline.warnings.map((w) => w.message),
    formatTime: (s) => formatElapsed(s),
    ...(start ? { formatGmt: (s: number) => formatGmt(start, s) } : {}),
  };
}

export function timelinePdf(plan: PlanView, timeline: PlanTimeline): Promise<Buffer> {
  return buildCueCardPdf(cueCardDocument(plan, timeline));
}
