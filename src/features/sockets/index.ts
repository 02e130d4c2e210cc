export { useSocketPlanner, type SocketPlanner, type SocketPlannerStation } from './components/socket-planner';
export { YawPitchDiagram } from './components/yaw-pitch-diagram';
export type { SocketScenePieces } from './components/socket-overlay';
