export { useSocketPlanner, type SocketPlanner, type SocketPlannerStation } from './lib/use-socket-planner';
export { SocketPlannerControls } from './components/socket-planner-controls';
export { SocketPlanResults } from './components/socket-plan-results';
export { SocketPlannerOverlay } from './components/socket-planner-overlay';
export { YawPitchDiagram } from './components/yaw-pitch-diagram';
