/**
 * Units at the edge of the product: SI inside (metres, seconds), metres or feet and `h:mm` elapsed
 * time in the UI.
 */

/** 1 ft = 0.3048 m exactly (NIST SP 811). */
export const METRES_PER_FOOT = 0.3048;

export const LENGTH_UNITS = ['m', 'ft'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

export function feetToMetres(feet: number): number {
  return feet * METRES_PER_FOOT;
}

export function metresToFeet(metres: number): number {
  return metres / METRES_PER_FOOT;
}

export function toMetres(value: number, unit: LengthUnit): number {
  return unit === 'ft' ? feetToMetres(value) : value;
}

export function fromMetres(metres: number, unit: LengthUnit): number {
  return unit === 'ft' ? metresToFeet(metres) : metres;
}

/** `25.9 m` or `85.0 ft`. */
export function formatLength(metres: number, unit: LengthUnit = 'm', digits = 1): string {
  return `${fromMetres(metres, unit).toFixed(digits)} ${unit}`;
}

/**
 * A message's lengths (`30.48 m`) restated in the unit the person works in: in feet, `100.0 ft`;
 * in metres the text is unchanged. Keeps the answer in the unit the question was asked in.
 */
export function restateLengths(text: string, unit: LengthUnit): string {
  if (unit === 'm') return text;
  return text.replace(/(-?\d+(?:\.\d+)?) m\b/g, (_, n: string) => formatLength(Number(n), unit));
}

/**
 * Elapsed time as `h:mm` (rounded to the nearest minute) or, with `withSeconds`, `h:mm:ss` (nearest
 * second). Negative values (a margin past the limit) keep their sign: `-0:15`.
 */
export function formatElapsed(seconds: number, options: { withSeconds?: boolean } = {}): string {
  if (!Number.isFinite(seconds)) return '–';
  const sign = seconds < 0 ? '-' : '';
  const unit = options.withSeconds ? 1 : 60;
  const whole = Math.round(Math.abs(seconds) / unit) * unit;
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const s = whole % 60;
  const mm = String(m).padStart(2, '0');
  return options.withSeconds ? `${sign}${h}:${mm}:${String(s).padStart(2, '0')}` : `${sign}${h}:${mm}`;
}

/**
 * The GMT clock time `seconds` of EVA elapsed time after `startGmt` (an ISO date and time): `HH:MM`
 * (the nearest minute) or, with `withSeconds`, `HH:MM:SS`. Wraps past midnight like a clock.
 */
export function formatGmt(
  startGmt: string,
  seconds: number,
  options: { withSeconds?: boolean } = {},
): string {
  const at = Date.parse(startGmt) + seconds * 1000;
  if (!Number.isFinite(at)) return '–';
  const unit = options.withSeconds ? 1000 : 60_000;
  const text = new Date(Math.round(at / unit) * unit).toISOString();
  return text.slice(11, options.withSeconds ? 19 : 16);
}

const GMT_TIME_RE = /^([01]?\d|2[0-3]):([0-5]\d)$/;
const GMT_DATE_TIME_RE = /^(\d{4}-\d{2}-\d{2})[ T]([01]\d|2[0-3]):([0-5]\d)$/;

/**
 * Reads a start time typed in the UI: `09:30` (GMT on `date`) or `2031-06-12 09:30` (another day);
 * blank is no start time. The value is `YYYY-MM-DDTHH:MM:00Z`.
 */
export function parseGmtStart(
  text: string,
  date: string,
): { ok: true; value: string | null } | { ok: false; message: string } {
  const t = text.trim();
  if (t === '') return { ok: true, value: null };
  const time = GMT_TIME_RE.exec(t);
  if (time) return { ok: true, value: `${date}T${time[1].padStart(2, '0')}:${time[2]}:00Z` };
  const full = GMT_DATE_TIME_RE.exec(t);
  if (full && Number.isFinite(Date.parse(`${full[1]}T00:00:00Z`)))
    return { ok: true, value: `${full[1]}T${full[2]}:${full[3]}:00Z` };
  return { ok: false, message: 'enter a GMT time as hh:mm (or YYYY-MM-DD hh:mm for another day)' };
}

/** Seconds as minutes: `36 min`, or `36.1 min` with one digit. */
export function formatMinutes(seconds: number, digits = 0): string {
  if (!Number.isFinite(seconds)) return '–';
  return `${(seconds / 60).toFixed(digits)} min`;
}

export type ParseResult = { ok: true; value: number } | { ok: false; message: string };

const LENGTH_RE = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*(m|metres?|meters?|ft|feet|foot|')?$/i;

/**
 * Reads a length typed in the UI: `25.9`, `25.9 m`, `85 ft`, `85'`. A bare number is in
 * `defaultUnit`. The value is returned in metres; negative lengths are refused.
 */
export function parseLength(text: string, defaultUnit: LengthUnit = 'm'): ParseResult {
  const match = LENGTH_RE.exec(text.trim());
  if (!match) return { ok: false, message: 'enter a length such as 25.9 m or 85 ft' };
  const value = Number(match[1]);
  if (!Number.isFinite(value)) return { ok: false, message: 'enter a finite number' };
  if (value < 0) return { ok: false, message: 'a length cannot be negative' };
  const suffix = match[2]?.toLowerCase();
  const unit: LengthUnit = suffix === undefined ? defaultUnit : suffix.startsWith('m') ? 'm' : 'ft';
  return { ok: true, value: toMetres(value, unit) };
}

const CLOCK_RE = /^(\d+):([0-5]\d)(?::([0-5]\d))?$/;
const MINUTES_RE = /^(\d+(?:\.\d*)?|\.\d+)\s*(?:m|min|mins|minutes?)?$/i;

/**
 * Reads a duration typed in the UI: `1:30` (h:mm), `1:30:15` (h:mm:ss) or a number of minutes
 * (`45`, `45 min`). Returns seconds.
 */
export function parseDuration(text: string): ParseResult {
  const t = text.trim();
  const clock = CLOCK_RE.exec(t);
  if (clock) {
    return { ok: true, value: Number(clock[1]) * 3600 + Number(clock[2]) * 60 + Number(clock[3] ?? 0) };
  }
  const minutes = MINUTES_RE.exec(t);
  if (minutes) return { ok: true, value: Math.round(Number(minutes[1]) * 60) };
  return { ok: false, message: 'enter a duration as h:mm, h:mm:ss or minutes' };
}
