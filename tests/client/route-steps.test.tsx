import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import kestrel from '../../server/db/seed/kestrel-station.json';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { ROUTE_MODES, type RouteFeasible, type RouteMode, type RouteResult } from '@shared/schemas/route';
import { parseStationDocument } from '@shared/schemas/station';
import { METRES_PER_FOOT } from '@shared/compute/units';
import { routeSteps } from '@/features/routes/lib/route-steps';
import { cleanup, render, screen, within } from '@testing-library/react';
import {
  allModesAgree,
  bestPerColumn,
  COMPARISON_COLUMNS,
  formatMinSec,
} from '@/features/routes/lib/mode-comparison';
import { ModeComparisonTable } from '@/features/routes/components/mode-comparison-table';
import { routeOverlayModel } from '@/features/routes/lib/route-overlay';
import { formatDuration } from '@/features/routes/lib/format-route';
import { matchNodes } from '@/features/routes/components/node-picker';

// The steps are derived from the real engine's routes on the demo station, never from hand-made routes.
const parsed = parseStationDocument(kestrel);
if (!parsed.ok) throw new Error('the demo station does not parse');
const doc = parsed.doc;
const compiled = compileStation(doc);
const keys = doc.nodes.map((n) => n.key);
const positions = new Map(doc.nodes.map((n) => [n.key, n.position]));

function route(
  from: string,
  to: string,
  mode: RouteMode,
  tetherLengthM: number,
  allowRide: boolean,
): RouteFeasible | null {
  const r = findRoute(compiled, doc.settings, { from, to, mode, tetherLengthM, allowRide });
  return r.feasible ? r : null;
}

const metresIn = (text: string) => {
  const m = /(\d+\.\d) (m|ft) /.exec(text);
  if (!m) throw new Error(`no length in "${text}"`);
  return Number(m[1]) * (m[2] === 'ft' ? METRES_PER_FOOT : 1);
};

const routeArb = fc
  .record({
    from: fc.constantFrom(...keys),
    to: fc.constantFrom(...keys),
    mode: fc.constantFrom(...ROUTE_MODES),
    tether: fc.double({ min: 5, max: 40, noNaN: true }),
    ride: fc.boolean(),
  })
  .map(({ from, to, mode, tether, ride }) => (from === to ? null : route(from, to, mode, tether, ride)))
  .filter((r): r is RouteFeasible => r !== null);

describe('route steps in the trade’s words', () => {
  it('name every swap in order, clip before release, with the engine’s nodes and count', () => {
    fc.assert(
      fc.property(routeArb, fc.constantFrom('m' as const, 'ft' as const), (r, unit) => {
        const steps = routeSteps(r, unit);
        const swaps = steps.filter((s) => s.kind === 'swap');
        expect(swaps.map((s) => s.nodeKey)).toEqual(r.swaps.map((s) => s.node));
        expect(swaps.map((s) => s.swapNumber)).toEqual(r.swaps.map((_, i) => i + 1));
        for (const s of swaps)
          expect(s.text).toBe(`Tether swap at ${s.nodeKey}: clip the new hook, then release the old one`);
        expect(steps[0].kind).toBe('start');
        expect(steps.at(-1)).toMatchObject({ kind: 'arrive', nodeKey: r.nodes.at(-1) });
      }),
      { numRuns: 150 },
    );
  });

  it('move steps add up to the route length, end where the next step starts, and merge only same-kind runs', () => {
    fc.assert(
      fc.property(routeArb, fc.constantFrom('m' as const, 'ft' as const), (r, unit) => {
        const steps = routeSteps(r, unit);
        const moves = steps.filter((s) => s.kind === 'handrail' || s.kind === 'hop' || s.kind === 'ride');
        const total = moves.reduce((sum, s) => sum + metresIn(s.text), 0);
        // each shown length is rounded to 0.1 of its unit
        expect(Math.abs(total - r.lengthM)).toBeLessThanOrEqual(
          moves.length * 0.05 * (unit === 'ft' ? METRES_PER_FOOT : 1) + 1e-9,
        );
        for (let i = 1; i < steps.length; i++) {
          const [a, b] = [steps[i - 1], steps[i]];
          if (a.kind !== 'swap' && b.kind !== 'swap')
            expect(a.kind === b.kind && a.kind !== 'start').toBe(false);
        }
        // a hop or ride leg in the route shows as a step of that kind
        for (const kind of ['hop', 'ride'] as const) {
          expect(moves.some((m) => m.kind === kind)).toBe(r.legs.some((l) => l.kind === kind));
        }
        for (const m of moves) {
          const word = {
            handrail: /^Translate .* along the handrail to /,
            hop: /^Hop /,
            ride: /^Ride the arm /,
          }[m.kind as 'hop'];
          expect(m.text).toMatch(word);
          expect(m.text.endsWith(` to ${m.nodeKey}`)).toBe(true);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('says "Translate 4.2 m along the handrail to …" for a short handrail run', () => {
    const r = route('PB4-W01', 'PB4-A02', 'fastest', 25.9, false)!;
    expect(r).not.toBeNull();
    const move = routeSteps(r).find((s) => s.kind === 'handrail')!;
    expect(move.text).toBe(`Translate ${r.lengthM.toFixed(1)} m along the handrail to PB4-A02`);
  });

  it('the 3D overlay clips the tether at the start and at every swap, path through every route node', () => {
    fc.assert(
      fc.property(routeArb, (r) => {
        const model = routeOverlayModel(r, (k) => positions.get(k))!;
        expect(model.path).toHaveLength(r.nodes.length);
        expect(model.clips.map((c) => c.key)).toEqual([r.nodes[0], ...r.swaps.map((s) => s.node)]);
        expect(model.swaps.map((s) => s.number)).toEqual(r.swaps.map((_, i) => i + 1));
      }),
      { numRuns: 60 },
    );
    const r = route('PB4-W01', 'SB4-W01', 'balanced', 25.9, false)!;
    expect(routeOverlayModel(r, (k) => (k === r.nodes[3] ? undefined : positions.get(k)))).toBeNull();
  });
});

describe('mode comparison', () => {
  it('marks exactly the least value of each column among the feasible modes', () => {
    fc.assert(
      fc.property(
        fc.array(fc.option(routeArb, { nil: undefined }), { minLength: 3, maxLength: 3 }),
        fc.boolean(),
        (rs, oneInfeasible) => {
          const results: Partial<Record<RouteMode, RouteResult>> = {};
          ROUTE_MODES.forEach((m, i) => {
            if (rs[i]) results[m] = rs[i];
          });
          if (oneInfeasible)
            results.balanced = { feasible: false, mode: 'balanced', reason: 'x', reasonCode: 'disconnected' };
          const best = bestPerColumn(results);
          for (const c of COMPARISON_COLUMNS) {
            const feasible = ROUTE_MODES.filter((m) => results[m]?.feasible);
            const values = feasible.map((m) => (results[m] as RouteFeasible)[c]);
            const least = Math.min(...values);
            expect(best[c]).toEqual(
              feasible.filter((m) => (results[m] as RouteFeasible)[c] <= least + 1e-6 * Math.max(1, least)),
            );
            if (oneInfeasible) expect(best[c]).not.toContain('balanced');
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  it('on the demo station the fewest-swaps mode never has more swaps than fastest (PB4-W01 → SB4-W01)', () => {
    const results = Object.fromEntries(
      ROUTE_MODES.map((m) => [m, route('PB4-W01', 'SB4-W01', m, 25.9, false)!]),
    );
    const best = bestPerColumn(results);
    expect(best.swapCount).toContain('fewest-swaps');
    expect(best.travelSeconds).toContain('fastest');
    expect(results.fastest.swapCount).toBeGreaterThan(0);
  });
});

describe('route formatting and node search', () => {
  it('shows short times as m:ss min and long ones as h:mm h', () => {
    expect(formatDuration(553)).toBe('9:13 min');
    expect(formatDuration(59.6)).toBe('1:00 min');
    expect(formatDuration(3600)).toBe('1:00 h');
    expect(formatDuration(5430)).toBe('1:31 h');
  });

  it('finds keys by prefix first, then by label', () => {
    const options = doc.nodes.map((n) => ({ key: n.key, label: n.label, kind: n.kind }));
    const byPrefix = matchNodes(options, 'sb4-w');
    expect(byPrefix.map((o) => o.key)).toEqual(['SB4-W01']);
    const airlock = doc.nodes.find((n) => n.kind === 'airlock')!;
    expect(matchNodes(options, airlock.label!.slice(0, 6)).map((o) => o.key)).toContain(airlock.key);
    expect(matchNodes(options, 'pb', 5)).toHaveLength(5);
  });
});

describe('mode comparison table', () => {
  const demo = () =>
    Object.fromEntries(ROUTE_MODES.map((m) => [m, route('PB3-W01', 'SB4-W01', m, 25.9, false)!])) as Record<
      RouteMode,
      RouteFeasible
    >;

  it('says once that all three modes give the same route (PB3-W01 → SB4-W01 on the demo station)', () => {
    const results = demo();
    expect(allModesAgree(results)).toBe(true);
    render(<ModeComparisonTable results={results} chosen="fastest" unit="m" onChoose={() => {}} />);
    expect(screen.getByTestId('modes-agree').textContent).toMatch(
      /^All three modes give the same route: \d+\.\d m, \d+:\d\d min of travel, 1 swap, \d+:\d\d min in all\.$/,
    );
    expect(screen.queryByRole('table')).toBeNull();
    cleanup();
  });

  it('marks the best only in the columns where the modes differ, with times as m:ss', () => {
    const results = demo();
    // another route of one more swap for balanced: travel and length the same, swaps and total not
    results.balanced = {
      ...results.balanced,
      swapCount: results.balanced.swapCount + 1,
      totalSeconds: results.balanced.totalSeconds + doc.settings.swapSeconds,
    };
    expect(allModesAgree(results)).toBe(false);
    render(<ModeComparisonTable results={results} chosen="balanced" unit="ft" onChoose={() => {}} />);
    const rows = screen.getAllByRole('row').slice(1);
    const starred = rows.map((r) => within(r).queryAllByText('(best)').length);
    // fastest and fewest swaps are best in swaps and total; no one is starred for length or travel
    expect(starred).toEqual([2, 2, 0]);
    expect(within(rows[0]).getAllByRole('cell')[4].textContent).toBe(
      `${formatMinSec(results.fastest.totalSeconds)}★ (best)`,
    );
    expect(within(rows[0]).getAllByRole('cell')[1].textContent).toMatch(/^\d+\.\d ft$/);
    expect(rows[2].getAttribute('aria-current')).toBe('true');
    cleanup();
  });
});
