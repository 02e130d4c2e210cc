import { describe, expect, it } from 'vitest';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { CUE_SWAPS_SPELLED_OUT, cueCardDocument } from '../../server/modules/plans/plan-export.service';
import { benchEngine, benchPlanOf, benchTask, exportedDay, worksitesOf } from '../../bench/plans';

/** A day of tasks at worksites across a generated truss, as the plan screen's exports see it. */
function longDay() {
  const doc = generateTrussStation({ nodes: 6_000, seed: 5 });
  const engine = benchEngine(doc);
  const rand = seededRandom(11);
  const sites = worksitesOf(doc);
  const crews = ['EV1', 'EV2', 'both'] as const;
  const dayPlan = benchPlanOf(
    Array.from({ length: 16 }, (_, i) =>
      benchTask(rand, i, sites[Math.floor(rand() * sites.length)], crews[i % 3]),
    ),
    [],
  );
  return exportedDay(doc, engine, dayPlan, 'Across the truss');
}

describe('cue cards of a long day', () => {
  const { plan, timeline } = longDay();
  const document = cueCardDocument(plan, timeline);

  it.each(['EV1', 'EV2'] as const)(
    '%s: a route of many swaps is one step naming them in order; the rest a step a block',
    (member) => {
      const blocks = timeline.crew[member].blocks;
      const card = document.cards.find((c) => c.member === member)!;
      const swapsOf = (routeIndex: number) =>
        blocks.filter((b) => b.type === 'swap' && b.routeIndex === routeIndex).map((b) => b.swapNode);
      const long = new Set(
        blocks
          .filter((b) => b.type === 'translate' && swapsOf(b.routeIndex!).length > CUE_SWAPS_SPELLED_OUT)
          .map((b) => b.routeIndex!),
      );
      expect(long.size, `${member} crosses the truss`).toBeGreaterThan(0);
      // every block is in exactly one step: the steps tile the day without gaps or overlaps
      expect(card.steps[0].start).toBe(blocks[0].start);
      expect(card.steps.at(-1)!.end).toBe(blocks.at(-1)!.end);
      for (let i = 1; i < card.steps.length; i++) expect(card.steps[i].start).toBe(card.steps[i - 1].end);
      const merged = card.steps.filter((s) => / tether swaps$/.test(s.text));
      expect(merged).toHaveLength(
        [...long].filter((r) => blocks.some((b) => b.routeIndex === r && b.type === 'translate')).length,
      );
      for (const [i, routeIndex] of [...long].entries()) {
        const swaps = swapsOf(routeIndex);
        expect(merged[i].text).toMatch(new RegExp(`, ${swaps.length} tether swaps$`));
        expect(merged[i].details![0]).toBe(`swaps at ${swaps.join(', ')}`);
      }
      const spelledOut = blocks.filter((b) => !long.has(b.routeIndex ?? -1)).length;
      expect(card.steps).toHaveLength(spelledOut + merged.length);
    },
  );
});
