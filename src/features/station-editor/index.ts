export { EditPanel, type EditPanelProps } from './components/edit-panel';
