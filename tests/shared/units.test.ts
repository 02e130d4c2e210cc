import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  METRES_PER_FOOT,
  feetToMetres,
  formatElapsed,
  formatGmt,
  formatLength,
  formatMinutes,
  parseGmtStart,
  metresToFeet,
  parseDuration,
  parseLength,
  restateLengths,
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

describe('lengths restated in the unit asked in', () => {
  it('turns the metres of an engine message into feet (1 ft = 0.3048 m, NIST SP 811), and leaves metres alone', () => {
    const text =
      'The quickest way needs a tether of at least 30.48 m; this fits the 25.9 m tether (1 mile away).';
    expect(restateLengths(text, 'ft')).toBe(
      'The quickest way needs a tether of at least 100.0 ft; this fits the 85.0 ft tether (1 mile away).',
    );
    expect(restateLengths(text, 'm')).toBe(text);
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

  it('GMT clock times from a start and elapsed seconds (worked by hand)', () => {
    expect(formatGmt('2031-06-12T09:30:00Z', 0)).toBe('09:30');
    expect(formatGmt('2031-06-12T09:30:00Z', 6.5 * 3600 + 29)).toBe('16:00');
    expect(formatGmt('2031-06-12T09:30:00Z', 3661, { withSeconds: true })).toBe('10:31:01');
    // an offset is read as the moment it names; past midnight the clock wraps
    expect(formatGmt('2031-06-12T23:30:00+02:00', 3 * 3600)).toBe('00:30');
    expect(formatGmt('not a time', 0)).toBe('–');
  });

  it('GMT clock minus the start is the elapsed time, to the minute (fast-check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 23 * 3600 }), (s) => {
        const [h, m] = formatGmt('2031-06-12T00:00:00Z', s).split(':').map(Number);
        expect(h * 60 + m).toBe(Math.round(s / 60) % (24 * 60));
      }),
    );
  });

  it('reads a typed start: hh:mm on the plan date, a date and time, or blank for none', () => {
    expect(parseGmtStart('9:05', '2031-06-12')).toEqual({ ok: true, value: '2031-06-12T09:05:00Z' });
    expect(parseGmtStart(' 2031-06-13 00:10 ', '2031-06-12')).toEqual({
      ok: true,
      value: '2031-06-13T00:10:00Z',
    });
    expect(parseGmtStart('', '2031-06-12')).toEqual({ ok: true, value: null });
    for (const bad of ['24:00', '9.05', '2031-13-40 09:00', 'noon'])
      expect(parseGmtStart(bad, '2031-06-12').ok).toBe(false);
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
