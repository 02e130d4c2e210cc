export { useRouteFinder, type RouteFinder, type RouteFinderStation } from './lib/use-route-finder';
export { RouteFinderPanel } from './components/route-finder-panel';
export { RouteOverlay } from './components/route-overlay';
