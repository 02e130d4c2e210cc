import type { Vec3 } from '@shared/schemas/station';

/**
 * The station body frame the scene draws in, as the station document and its generators use it:
 * the truss runs along x with +x to starboard (starboard bays at +x, port bays at −x), +y is fore
 * (the direction of flight), +z is zenith (away from Earth). Nadir is −z, aft −y, port −x.
 * The camera's up is +z, so the Earth side of the model is always at the bottom of the screen.
 */
export const STATION_UP: Vec3 = [0, 0, 1];

export const PRESET_VIEWS = ['fore', 'aft', 'port', 'starboard', 'zenith', 'nadir'] as const;
export type PresetView = (typeof PRESET_VIEWS)[number];

/** Where the camera sits, seen from the model's centre: "fore" looks at the model from the fore side. */
export const PRESET_DIRECTIONS: Record<PresetView, Vec3> = {
  fore: [0, 1, 0],
  aft: [0, -1, 0],
  port: [-1, 0, 0],
  starboard: [1, 0, 0],
  zenith: [0, 0, 1],
  nadir: [0, 0, -1],
};

export const PRESET_LABELS: Record<PresetView, string> = {
  fore: 'Fore',
  aft: 'Aft',
  port: 'Port',
  starboard: 'Starboard',
  zenith: 'Zenith',
  nadir: 'Nadir',
};
