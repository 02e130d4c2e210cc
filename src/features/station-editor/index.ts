export { useStationEditor, type EditorScreenContext } from './components/use-station-editor';
export { EditPanel, type EditPanelProps } from './components/edit-panel';
