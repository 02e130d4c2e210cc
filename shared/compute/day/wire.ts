import type { RouteFeasible, RouteLeg } from '../../schemas/route';
import type { Timeline } from './types';

/**
 * The timeline as it travels over HTTP. A long day on a large station has hundreds of routes of
 * hundreds of legs each, and a leg as an object repeats its two node keys and prints its lengths to
 * seventeen digits. On the wire a leg is `[kind, metres, seconds]` (its ends are the route's
 * consecutive nodes, its start the sum of the legs before it), metres to the millimetre and seconds
 * to the hundredth; everything else is as computed. `fromWire` gives back the timeline's shape.
 */
export type WireLeg = [kind: 0 | 1 | 2, lengthM: number, seconds: number];
export type WireRoute = Omit<RouteFeasible, 'legs'> & { legs: WireLeg[] };
export type WireTimeline<T extends Timeline = Timeline> = Omit<T, 'routes'> & { routes: WireRoute[] };

const KINDS: RouteLeg['kind'][] = ['handrail', 'hop', 'ride'];
const round = (v: number, step: number) => Math.round(v / step) * step;

export function toWire<T extends Timeline>(timeline: T): WireTimeline<T> {
  return {
    ...timeline,
    routes: timeline.routes.map((r) => ({
      ...r,
      legs: r.legs.map((l): WireLeg => [
        KINDS.indexOf(l.kind) as 0 | 1 | 2,
        Number(round(l.lengthM, 1e-3).toFixed(3)),
        Number(round(l.seconds, 1e-2).toFixed(2)),
      ]),
    })),
  };
}

export function fromWire<T extends Timeline>(wire: WireTimeline<T>): T {
  return {
    ...wire,
    routes: wire.routes.map((r) => {
      let startM = 0;
      const legs = r.legs.map(([kind, lengthM, seconds], i): RouteLeg => {
        const leg = { from: r.nodes[i], to: r.nodes[i + 1], kind: KINDS[kind], lengthM, seconds, startM };
        startM += lengthM;
        return leg;
      });
      return { ...r, legs };
    }),
  } as T;
}
