import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  METRES_PER_FOOT,
  feetToMetres,
  formatElapsed,
  formatLength,
  formatMinutes,
  metresToFeet,
  parseDuration,
  parseLength,
} from '@shared/compute/units';

describe('length units', () => {
  it('1 ft = 0.3048 m exactly (NIST SP 811)', () => {
    expect(METRES_PER_FOOT).toBe(0.3048);
    expect(feetToMetres(1)).toBe(0.3048);
    // 1 mile = 5280 ft = 1609.344 m exactly (NIST SP 811, same definition)
    expect(feetToMetres(5280)).toBeCloseTo(1609.344, 9);
  });

  it('the commonly reported 85 ft safety tether is 25.9 m (press reports of station spacewalks)', () => {
    expect(formatLength(feetToMetres(85), 'm')).toBe('25.9 m');
    expect(formatLength(25.9, 'ft', 0)).toBe('85 ft');
  });

  it('metres → feet → metres round-trips (fast-check)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), (m) => {
        expect(feetToMetres(metresToFeet(m))).toBeCloseTo(m, 6);
      }),
    );
  });

  it('a formatted length parses back to the same length (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 100000 }),
        fc.constantFrom('m' as const, 'ft' as const),
        (tenths, unit) => {
          const metres = unit === 'ft' ? feetToMetres(tenths / 10) : tenths / 10;
          const parsed = parseLength(formatLength(metres, unit));
          expect(parsed.ok && parsed.value).toBeCloseTo(metres, 9);
        },
      ),
    );
  });

  it('parses UI input in m or ft and refuses the rest', () => {
    expect(parseLength('85 ft')).toEqual({ ok: true, value: 85 * 0.3048 });
    expect(parseLength("55'")).toEqual({ ok: true, value: 55 * 0.3048 });
    expect(parseLength('12', 'ft')).toEqual({ ok: true, value: 12 * 0.3048 });
    expect(parseLength(' 7.5 m ')).toEqual({ ok: true, value: 7.5 });
    expect(parseLength('-3 m').ok).toBe(false);
    expect(parseLength('three').ok).toBe(false);
    expect(parseLength('3 yd').ok).toBe(false);
  });
});

describe('elapsed time', () => {
  it('formats h:mm and h:mm:ss', () => {
    expect(formatElapsed(0)).toBe('0:00');
    expect(formatElapsed(23400)).toBe('6:30');
    expect(formatElapsed(3599)).toBe('1:00');
    expect(formatElapsed(3661, { withSeconds: true })).toBe('1:01:01');
    expect(formatElapsed(-900)).toBe('-0:15');
    expect(formatElapsed(36 * 3600 + 5 * 60)).toBe('36:05');
  });

  it('formats minutes', () => {
    expect(formatMinutes(2166.6)).toBe('36 min');
    expect(formatMinutes(2166.6, 1)).toBe('36.1 min');
  });

  it('h:mm:ss formatting parses back to the same whole second (fast-check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 48 * 3600 }), (s) => {
        expect(parseDuration(formatElapsed(s, { withSeconds: true }))).toEqual({ ok: true, value: s });
      }),
    );
  });

  it('parses durations typed as h:mm or minutes', () => {
    expect(parseDuration('1:30')).toEqual({ ok: true, value: 5400 });
    expect(parseDuration('45')).toEqual({ ok: true, value: 2700 });
    expect(parseDuration('45 min')).toEqual({ ok: true, value: 2700 });
    expect(parseDuration('1:75').ok).toBe(false);
    expect(parseDuration('soon').ok).toBe(false);
  });
});
