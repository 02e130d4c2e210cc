import type { StationDocument, StationDocumentInput } from '@shared/schemas/station';
import { DEFAULT_SETTINGS } from '@shared/schemas/station';

/**
 * Named fixtures of a small, valid station: an airlock, a handrail run with anchors and junctions,
 * a hop across to a second face, an arm ride, a socket and a worksite, one keep-out and one caution.
 * Keys are exported so tests name what they mean, not a string they hope is in the document.
 */
export const FIXTURE_KEYS = {
  airlock: 'AL-1',
  anchorNear: 'T1-A01',
  junction: 'T1-J01',
  anchorFar: 'T1-A02',
  anchorOtherFace: 'T2-A01',
  socket: 'T2-S1',
  worksite: 'T2-W1',
  rideEnd: 'T3-A01',
  keepOut: 'RAD-1',
  caution: 'ANT-1',
  segment: 'T1',
} as const;

const K = FIXTURE_KEYS;

export function buildStationDocument(overrides: Partial<StationDocumentInput> = {}): StationDocumentInput {
  return {
    format: 'tetherwise.station',
    version: 1,
    name: 'Test Station',
    orbit: { altitudeKm: 410, betaDeg: 20 },
    settings: structuredClone(DEFAULT_SETTINGS) as StationDocument['settings'],
    segments: [
      { key: K.segment, label: 'Test truss bay 1', kind: 'truss', center: [5, 0, 0], size: [10, 3, 3] },
      {
        key: 'LAB',
        label: 'Test module',
        kind: 'module',
        center: [-4, 0, 0],
        size: [6, 4, 4],
        rotationDeg: [0, 0, 90],
      },
    ],
    nodes: [
      { key: K.airlock, kind: 'airlock', label: 'Airlock hatch', position: [0, 0, 1.5] },
      { key: K.anchorNear, kind: 'anchor', label: 'Anchor 1', position: [2, 0, 1.5] },
      { key: K.junction, kind: 'junction', position: [5, 0, 1.5], notes: 'mid-run handrail stanchion' },
      { key: K.anchorFar, kind: 'anchor', position: [8, 0, 1.5] },
      { key: K.anchorOtherFace, kind: 'anchor', position: [8, 1.5, 0] },
      {
        key: K.socket,
        kind: 'socket',
        label: 'Foot restraint socket',
        position: [9, 1.5, 0],
        normal: [0, 1, 0],
      },
      { key: K.worksite, kind: 'worksite', label: 'Pump site', position: [9.5, 1.6, 0.4] },
      { key: K.rideEnd, kind: 'anchor', position: [30, 0, 1.5] },
    ],
    edges: [
      { from: K.airlock, to: K.anchorNear, kind: 'handrail' },
      { from: K.anchorNear, to: K.junction, kind: 'handrail' },
      { from: K.junction, to: K.anchorFar, kind: 'handrail', lengthM: 3.2 },
      { from: K.anchorFar, to: K.anchorOtherFace, kind: 'hop', label: 'corner hop' },
      { from: K.anchorOtherFace, to: K.socket, kind: 'handrail' },
      { from: K.socket, to: K.worksite, kind: 'handrail', closed: true },
      { from: K.airlock, to: K.rideEnd, kind: 'ride' },
    ],
    hazards: [
      {
        key: K.keepOut,
        kind: 'keep-out',
        label: 'Radiator',
        shape: 'sphere',
        center: [20, 0, 1.5],
        radiusM: 2,
      },
      { key: K.caution, kind: 'caution', label: 'Antenna', shape: 'box', min: [4, -1, 2], max: [6, 1, 3] },
    ],
    ...overrides,
  };
}

/** The document as JSON bytes, ready to attach to a multipart request. */
export function stationDocumentFile(doc: unknown = buildStationDocument()): Buffer {
  return Buffer.from(JSON.stringify(doc));
}
