/**
 * Circular-orbit day and night for EVA planning. Kepler's third law for the period and the
 * cylindrical-shadow eclipse fraction (R. M. Sumanth, "Computation of Eclipse Time for Low-Earth
 * Orbiting Small Satellites", IJAAA 6(5), 2019).
 */

export interface EarthConstants {
  /** gravitational parameter, km³/s² */
  muKm3s2: number;
  /** equatorial radius, km */
  radiusKm: number;
}

/** NIMA TR8350.2, Department of Defense World Geodetic System 1984, 3rd ed. (2000). */
export const WGS84: EarthConstants = { muKm3s2: 398600.4418, radiusKm: 6378.137 };

export interface OrbitInput {
  altitudeKm: number;
  betaDeg: number;
}

export interface OrbitSummary {
  periodSeconds: number;
  eclipseSeconds: number;
  sunlitSeconds: number;
  /** |β| at or beyond which the orbit sees no shadow */
  criticalBetaDeg: number;
  eclipseFraction: number;
}

const DEG = Math.PI / 180;

function checkAltitude(altitudeKm: number): void {
  if (!Number.isFinite(altitudeKm) || altitudeKm <= 0) {
    throw new RangeError(`altitude must be a positive number of km (got ${altitudeKm})`);
  }
}

export function orbitalPeriodSeconds(altitudeKm: number, earth: EarthConstants = WGS84): number {
  checkAltitude(altitudeKm);
  const a = earth.radiusKm + altitudeKm;
  return 2 * Math.PI * Math.sqrt((a * a * a) / earth.muKm3s2);
}

/** Circular orbital speed √(μ/a), km/s. */
export function circularSpeedKmS(altitudeKm: number, earth: EarthConstants = WGS84): number {
  checkAltitude(altitudeKm);
  return Math.sqrt(earth.muKm3s2 / (earth.radiusKm + altitudeKm));
}

/** β* = asin(R/(R+h)), degrees. */
export function criticalBetaDeg(altitudeKm: number, earth: EarthConstants = WGS84): number {
  checkAltitude(altitudeKm);
  return Math.asin(earth.radiusKm / (earth.radiusKm + altitudeKm)) / DEG;
}

/** Fraction of the orbit in the Earth's cylindrical shadow; 0 when |β| ≥ β*. */
export function eclipseFraction(altitudeKm: number, betaDeg: number, earth: EarthConstants = WGS84): number {
  checkAltitude(altitudeKm);
  if (!Number.isFinite(betaDeg)) throw new RangeError(`beta angle must be finite (got ${betaDeg})`);
  const beta = Math.abs(betaDeg);
  if (beta >= criticalBetaDeg(altitudeKm, earth)) return 0;
  const R = earth.radiusKm;
  const h = altitudeKm;
  const ratio = Math.sqrt(h * h + 2 * R * h) / ((R + h) * Math.cos(beta * DEG));
  // ratio < 1 below β*; the clamp only absorbs rounding right at the boundary
  return Math.acos(Math.min(1, ratio)) / Math.PI;
}

export function orbitSummary(input: OrbitInput, earth: EarthConstants = WGS84): OrbitSummary {
  const periodSeconds = orbitalPeriodSeconds(input.altitudeKm, earth);
  const fraction = eclipseFraction(input.altitudeKm, input.betaDeg, earth);
  const eclipseSeconds = periodSeconds * fraction;
  return {
    periodSeconds,
    eclipseSeconds,
    sunlitSeconds: periodSeconds - eclipseSeconds,
    criticalBetaDeg: criticalBetaDeg(input.altitudeKm, earth),
    eclipseFraction: fraction,
  };
}

export type OrbitWindowKind = 'day' | 'night';

/** A stretch of orbital day or night, in seconds of EVA elapsed time. */
export interface OrbitWindow {
  kind: OrbitWindowKind;
  start: number;
  end: number;
}

export interface DayNightInput extends OrbitInput {
  /**
   * Where the orbit is when the EVA clock starts. Phase 0° is orbital sunrise; the phase grows
   * 360° per orbit, and each orbit is its sunlit arc first (0° up to 360°·(1 − f)), then its night
   * arc (up to 360°), f being the eclipse fraction. So 360°·(1 − f) is sunset.
   */
  phaseAtStartDeg?: number;
  /** The same thing as a time: seconds since the last orbital sunrise. Used when no phase is given. */
  secondsSinceSunrise?: number;
  durationSeconds: number;
}

/**
 * The day and night windows that tile [0, durationSeconds] of EVA elapsed time, in order, without
 * gaps or overlaps. The first and last windows are cut at the EVA's start and end. With no shadow
 * (|β| ≥ β*) the whole EVA is one day window.
 */
export function dayNightWindows(input: DayNightInput, earth: EarthConstants = WGS84): OrbitWindow[] {
  const { periodSeconds: T, sunlitSeconds: D, eclipseSeconds } = orbitSummary(input, earth);
  const duration = input.durationSeconds;
  if (!Number.isFinite(duration) || duration <= 0) return [];
  if (eclipseSeconds <= 0) return [{ kind: 'day', start: 0, end: duration }];

  const phaseSeconds =
    input.phaseAtStartDeg !== undefined
      ? (input.phaseAtStartDeg / 360) * T
      : (input.secondsSinceSunrise ?? 0);
  const offset = ((phaseSeconds % T) + T) % T;
  if (duration <= WINDOW_EPSILON_S) return [{ kind: offset < D ? 'day' : 'night', start: 0, end: duration }];

  // sunrise k happens at k·T − offset; computing each boundary from k keeps rounding from drifting
  const raw: OrbitWindow[] = [];
  for (let k = 0; k * T - offset < duration; k++) {
    const sunrise = k * T - offset;
    raw.push({ kind: 'day', start: sunrise, end: sunrise + D });
    raw.push({ kind: 'night', start: sunrise + D, end: (k + 1) * T - offset });
  }
  // clip to the EVA, drop rounding slivers at the ends, and re-join so the windows tile exactly
  const windows: OrbitWindow[] = [];
  for (const w of raw) {
    const start = Math.max(0, w.start);
    const end = Math.min(duration, w.end);
    if (end - start <= WINDOW_EPSILON_S) continue;
    const last = windows[windows.length - 1];
    if (last && last.kind === w.kind) last.end = end;
    else windows.push({ kind: w.kind, start: last ? last.end : 0, end });
  }
  windows[windows.length - 1].end = duration;
  return windows;
}

export interface WindowSlot {
  window: OrbitWindow;
  /** when the activity would start: the later of the window's start and `earliestStart` */
  start: number;
  end: number;
}

/**
 * The first night window in which an activity of `durationSeconds`, starting no earlier than
 * `earliestStart`, fits wholly; null when none of the given windows has room.
 */
export function nextNightWindowFitting(
  windows: readonly OrbitWindow[],
  earliestStart: number,
  durationSeconds: number,
): WindowSlot | null {
  for (const window of windows) {
    if (window.kind !== 'night') continue;
    const start = Math.max(window.start, earliestStart);
    if (start + durationSeconds <= window.end + WINDOW_EPSILON_S) {
      return { window, start, end: start + durationSeconds };
    }
  }
  return null;
}

/** Tolerance for "wholly inside a window": far below anything a planner schedules. */
export const WINDOW_EPSILON_S = 1e-6;

/** True when [start, end] lies inside one night window. */
export function isWithinNight(windows: readonly OrbitWindow[], start: number, end: number): boolean {
  return windows.some(
    (w) => w.kind === 'night' && w.start <= start + WINDOW_EPSILON_S && end <= w.end + WINDOW_EPSILON_S,
  );
}

/** The orbit event a start time is read from. */
export type OrbitEvent = 'sunrise' | 'sunset';

/**
 * The EVA's start read as a planner reads it: so many minutes after or before orbital sunrise or
 * sunset. `offsetSeconds` is signed (negative: before the event).
 */
export interface OrbitStart {
  event: OrbitEvent;
  offsetSeconds: number;
}

/** Where in the orbit the EVA clock starts, read against the orbit's sunrise and sunset. */
export interface OrbitStartReading extends OrbitStart {
  /** the arc the EVA starts in; always `day` when the orbit sees no shadow */
  arc: OrbitWindowKind;
  /** seconds into that arc (since sunrise in the day arc, since sunset at night) */
  intoArcSeconds: number;
  /** seconds to the arc's end (the next sunset or sunrise); null when the orbit sees no shadow */
  leftInArcSeconds: number | null;
  periodSeconds: number;
  eclipseSeconds: number;
}

/** An orbit's period and its sunlit and night arcs (`orbitSummary` gives them), seconds. */
export type OrbitArcs = Pick<OrbitSummary, 'periodSeconds' | 'sunlitSeconds' | 'eclipseSeconds'>;

const wrap = (s: number, T: number) => ((s % T) + T) % T;

/**
 * A phase at start (0° is orbital sunrise, 360° per orbit, the sunlit arc first) as minutes from the
 * nearer end of the arc it falls in: "12 min after sunrise" early in the day arc, "5 min before
 * sunrise" late in the night arc. With no shadow the phase is read from sunrise alone.
 */
export function orbitStartOfPhase(phaseDeg: number, orbit: OrbitArcs): OrbitStartReading {
  const { periodSeconds: T, sunlitSeconds: D, eclipseSeconds: E } = orbit;
  const s = wrap((phaseDeg / 360) * T, T);
  if (E <= 0) {
    return {
      event: 'sunrise',
      offsetSeconds: s,
      arc: 'day',
      intoArcSeconds: s,
      leftInArcSeconds: null,
      periodSeconds: T,
      eclipseSeconds: 0,
    };
  }
  const day = s < D;
  const into = day ? s : s - D;
  const left = day ? D - s : T - s;
  const [begins, ends]: [OrbitEvent, OrbitEvent] = day ? ['sunrise', 'sunset'] : ['sunset', 'sunrise'];
  const nearer: OrbitStart =
    into <= left ? { event: begins, offsetSeconds: into } : { event: ends, offsetSeconds: -left };
  return {
    ...nearer,
    arc: day ? 'day' : 'night',
    intoArcSeconds: into,
    leftInArcSeconds: left,
    periodSeconds: T,
    eclipseSeconds: E,
  };
}

/** The phase at start (degrees in [0, 360)) of a start given against sunrise or sunset. */
export function phaseOfOrbitStart(start: OrbitStart, orbit: OrbitArcs): number {
  if (!Number.isFinite(start.offsetSeconds))
    throw new RangeError(`the offset must be a finite number of seconds (got ${start.offsetSeconds})`);
  const { periodSeconds: T, sunlitSeconds: D } = orbit;
  const s = wrap((start.event === 'sunrise' ? 0 : D) + start.offsetSeconds, T);
  const deg = (s / T) * 360;
  // a whole orbit back to sunrise can round to 360: that is sunrise itself
  return deg >= 360 ? 0 : deg;
}

/** Whole minutes, the nearest: "12 min", "3 min". */
const minutesText = (seconds: number) => `${Math.round(Math.abs(seconds) / 60)} min`;

/**
 * "starts 12 min after orbital sunrise", "starts 5 min before orbital sunset", "starts at orbital
 * sunrise" (within half a minute of it): a planner reads the start to the minute.
 */
export function orbitStartText(start: OrbitStart): string {
  if (Math.round(Math.abs(start.offsetSeconds) / 60) === 0) return `starts at orbital ${start.event}`;
  const side = start.offsetSeconds < 0 ? 'before' : 'after';
  return `starts ${minutesText(start.offsetSeconds)} ${side} orbital ${start.event}`;
}

/** What is left of the start's arc, to the minute: "in daylight, sunset 42 min later". */
export function orbitStartArcText(reading: OrbitStartReading): string {
  if (reading.leftInArcSeconds === null) return 'no night on this orbit at this beta angle';
  const left = minutesText(reading.leftInArcSeconds);
  return reading.arc === 'day' ? `in daylight, sunset ${left} later` : `in night, sunrise ${left} later`;
}
