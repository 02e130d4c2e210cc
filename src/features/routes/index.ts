export { useRouteFinder, type RouteFinder, type RouteFinderStation } from './components/route-finder';
export type { ScenePieces } from './components/route-overlay';
