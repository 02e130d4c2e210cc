export { AnnotationsPanel } from './components/annotations-panel';
export { AnnotationPins } from './components/annotation-pins';

/** The Station screen's tab id for the notes, which a click on a pin brings to the front. */
export const NOTES_PANEL_ID = 'annotations';
