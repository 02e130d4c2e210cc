export {
  useStationNotes,
  NOTES_PANEL_ID,
  type NotesScreenContext,
  type StationNotes,
} from './components/use-station-notes';
export { AnnotationsPanel } from './components/annotations-panel';
export { AnnotationPins } from './components/annotation-pins';
