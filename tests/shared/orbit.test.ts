import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  WGS84,
  circularSpeedKmS,
  criticalBetaDeg,
  dayNightWindows,
  eclipseFraction,
  isWithinNight,
  nextNightWindowFitting,
  orbitSummary,
  orbitalPeriodSeconds,
  orbitStartArcText,
  orbitStartOfPhase,
  orbitStartText,
  phaseOfOrbitStart,
  type OrbitWindow,
} from '@shared/compute/orbit';

const minutes = (s: number) => s / 60;
/** within `tol` of a published value given to its last digit */
const near = (actual: number, expected: number, tol: number) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol);

describe('orbit constants and period', () => {
  it('uses the WGS 84 defining constants (NIMA TR8350.2, 3rd ed.)', () => {
    expect(WGS84.muKm3s2).toBe(398600.4418);
    expect(WGS84.radiusKm).toBe(6378.137);
  });

  it('circular orbit at 200 km: period 5,310 s, speed 7,784 m/s (Braeunig, Rocket and Space Technology, Problems 4.1–4.2)', () => {
    const braeunig = { muKm3s2: 3.986005e14 / 1e9, radiusKm: 6378.14 };
    near(orbitalPeriodSeconds(200, braeunig), 5310, 0.5);
    near(circularSpeedKmS(200, braeunig) * 1000, 7784, 0.5);
  });

  it('periods at 400 km and 420 km are 92.56 and 92.97 min (Kepler III with WGS 84 constants)', () => {
    near(minutes(orbitalPeriodSeconds(400)), 92.56, 0.005);
    near(minutes(orbitalPeriodSeconds(420)), 92.97, 0.005);
  });

  it('a station-like orbit (370–460 km) has a period of about 92 minutes (space agency public material)', () => {
    for (const h of [370, 410, 460]) {
      const p = minutes(orbitalPeriodSeconds(h));
      expect(p).toBeGreaterThan(91);
      expect(p).toBeLessThan(94);
    }
  });
});

describe('eclipse, cylindrical shadow (Sumanth 2019, IJAAA 6(5))', () => {
  it('at 400 km: β=0 36.11 min (f 0.3901), β=40° 32.80, β=60° 24.37, β=70° 4.27, β* = 70.22° (Sumanth 2019 eclipse formula, WGS 84 Rₑ)', () => {
    const at = (betaDeg: number) => orbitSummary({ altitudeKm: 400, betaDeg });
    near(minutes(at(0).eclipseSeconds), 36.11, 0.005);
    near(at(0).eclipseFraction, 0.3901, 0.00005);
    near(minutes(at(40).eclipseSeconds), 32.8, 0.005);
    near(minutes(at(60).eclipseSeconds), 24.37, 0.005);
    // steep near β*: 4.2647 here, the table rounds to 4.27
    near(minutes(at(70).eclipseSeconds), 4.27, 0.01);
    near(at(0).criticalBetaDeg, 70.22, 0.005);
    expect(at(71).eclipseSeconds).toBe(0);
  });

  it('at 280 km, β=0: about 37 min shadow and 53 min sunlit, 59 % of the orbit (encyclopedia "Beta angle")', () => {
    const s = orbitSummary({ altitudeKm: 280, betaDeg: 0 });
    near(minutes(s.eclipseSeconds), 37, 0.5);
    near(minutes(s.sunlitSeconds), 53, 0.5);
    near(s.sunlitSeconds / s.periodSeconds, 0.59, 0.005);
  });

  const altitude = fc.double({ min: 150, max: 2000, noNaN: true });
  const beta = fc.double({ min: -90, max: 90, noNaN: true });

  it('eclipse fraction never grows as |β| grows (fast-check)', () => {
    fc.assert(
      fc.property(altitude, beta, beta, (h, b1, b2) => {
        const [lo, hi] = Math.abs(b1) <= Math.abs(b2) ? [b1, b2] : [b2, b1];
        expect(eclipseFraction(h, hi)).toBeLessThanOrEqual(eclipseFraction(h, lo) + 1e-12);
      }),
    );
  });

  it('is zero at and beyond β*, positive below it (fast-check)', () => {
    fc.assert(
      fc.property(altitude, beta, (h, b) => {
        const f = eclipseFraction(h, b);
        if (Math.abs(b) >= criticalBetaDeg(h)) expect(f).toBe(0);
        else expect(f).toBeGreaterThan(0);
        expect(f).toBeLessThan(0.5);
      }),
    );
  });

  it('sunlit + eclipse = period (fast-check)', () => {
    fc.assert(
      fc.property(altitude, beta, (altitudeKm, betaDeg) => {
        const s = orbitSummary({ altitudeKm, betaDeg });
        expect(s.sunlitSeconds + s.eclipseSeconds).toBeCloseTo(s.periodSeconds, 6);
      }),
    );
  });

  it('refuses a non-positive altitude', () => {
    expect(() => orbitalPeriodSeconds(0)).toThrow(RangeError);
    expect(() => eclipseFraction(-5, 0)).toThrow(RangeError);
  });
});

describe('day and night windows across an EVA', () => {
  const input = fc.record({
    altitudeKm: fc.double({ min: 200, max: 1000, noNaN: true }),
    betaDeg: fc.double({ min: -90, max: 90, noNaN: true }),
    phaseAtStartDeg: fc.double({ min: 0, max: 359.999, noNaN: true }),
    durationSeconds: fc.double({ min: 1, max: 12 * 3600, noNaN: true }),
  });

  it('tile [0, duration] in order without gaps or overlaps, alternating day and night (fast-check)', () => {
    fc.assert(
      fc.property(input, (i) => {
        const w = dayNightWindows(i);
        expect(w[0].start).toBe(0);
        expect(w[w.length - 1].end).toBe(i.durationSeconds);
        for (let k = 0; k < w.length; k++) {
          expect(w[k].end).toBeGreaterThan(w[k].start);
          if (k > 0) {
            expect(w[k].start).toBe(w[k - 1].end);
            expect(w[k].kind).not.toBe(w[k - 1].kind);
          }
        }
      }),
    );
  });

  it('inner windows last exactly the sunlit and eclipse times (fast-check)', () => {
    fc.assert(
      fc.property(input, (i) => {
        const s = orbitSummary(i);
        const w = dayNightWindows(i);
        for (const win of w.slice(1, -1)) {
          const expected = win.kind === 'day' ? s.sunlitSeconds : s.eclipseSeconds;
          expect(win.end - win.start).toBeCloseTo(expected, 6);
        }
      }),
    );
  });

  it('phase 0 is orbital sunrise: the sunlit arc first, sunset at 360°·(1 − f)', () => {
    const orbit = { altitudeKm: 400, betaDeg: 0 };
    const s = orbitSummary(orbit);
    const w = dayNightWindows({ ...orbit, phaseAtStartDeg: 0, durationSeconds: 2 * s.periodSeconds });
    expect(w.map((x) => x.kind)).toEqual(['day', 'night', 'day', 'night']);
    expect(w[0].end).toBeCloseTo(s.sunlitSeconds, 9);
    expect(w[1].end).toBeCloseTo(s.periodSeconds, 9);

    const sunset = 360 * (1 - s.eclipseFraction);
    const atSunset = dayNightWindows({ ...orbit, phaseAtStartDeg: sunset, durationSeconds: 600 });
    expect(atSunset).toEqual([{ kind: 'night', start: 0, end: 600 }]);
  });

  it('secondsSinceSunrise is the same clock as the phase', () => {
    const orbit = { altitudeKm: 410, betaDeg: 20, durationSeconds: 23400 };
    const T = orbitalPeriodSeconds(410);
    const byPhase = dayNightWindows({ ...orbit, phaseAtStartDeg: 90 });
    const bySeconds = dayNightWindows({ ...orbit, secondsSinceSunrise: T / 4 });
    bySeconds.forEach((w, k) => {
      expect(w.kind).toBe(byPhase[k].kind);
      expect(w.end).toBeCloseTo(byPhase[k].end, 6);
    });
  });

  it('with no shadow (|β| ≥ β*) the whole EVA is day', () => {
    expect(
      dayNightWindows({ altitudeKm: 400, betaDeg: -75, phaseAtStartDeg: 300, durationSeconds: 3600 }),
    ).toEqual([{ kind: 'day', start: 0, end: 3600 }]);
  });
});

describe('nextNightWindowFitting', () => {
  const windows: OrbitWindow[] = [
    { kind: 'day', start: 0, end: 1000 },
    { kind: 'night', start: 1000, end: 3000 },
    { kind: 'day', start: 3000, end: 6000 },
    { kind: 'night', start: 6000, end: 8000 },
  ];

  it('starts at the window, or later when the activity cannot start before then', () => {
    expect(nextNightWindowFitting(windows, 0, 1500)).toEqual({ window: windows[1], start: 1000, end: 2500 });
    expect(nextNightWindowFitting(windows, 1200, 1500)).toEqual({
      window: windows[1],
      start: 1200,
      end: 2700,
    });
  });

  it('skips a night that has no room left and answers null when none fits', () => {
    expect(nextNightWindowFitting(windows, 2000, 1500)?.window).toBe(windows[3]);
    expect(nextNightWindowFitting(windows, 0, 2001)).toBeNull();
  });

  it('whatever it returns lies wholly inside a night window, at or after the earliest start (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 8000, noNaN: true }),
        fc.double({ min: 1, max: 2500, noNaN: true }),
        (earliest, duration) => {
          const slot = nextNightWindowFitting(windows, earliest, duration);
          if (slot) {
            expect(slot.start).toBeGreaterThanOrEqual(earliest);
            expect(isWithinNight(windows, slot.start, slot.end)).toBe(true);
          } else {
            expect(duration > 2000 || earliest + duration > 8000).toBe(true);
          }
        },
      ),
    );
  });
});

describe('the start as a clock phase: minutes from orbital sunrise or sunset', () => {
  // worked by hand: a 90 min orbit with a 54 min sunlit arc and 36 min of night
  const arcs = { periodSeconds: 5400, sunlitSeconds: 3240, eclipseSeconds: 2160 };

  it('reads a phase from the nearer end of its arc (worked by hand)', () => {
    // 8° of 360° is 120 s into the orbit: 2 min after sunrise, 52 min to sunset
    expect(orbitStartOfPhase(8, arcs)).toMatchObject({
      event: 'sunrise',
      offsetSeconds: 120,
      arc: 'day',
      intoArcSeconds: 120,
      leftInArcSeconds: 3120,
    });
    // 168° is 2520 s: 720 s (12 min) before the sunset at 3240 s
    expect(orbitStartOfPhase(168, arcs)).toMatchObject({ event: 'sunset', offsetSeconds: -720, arc: 'day' });
    // 240° is 3600 s: 6 min after sunset, 30 min to sunrise
    expect(orbitStartOfPhase(240, arcs)).toMatchObject({
      event: 'sunset',
      offsetSeconds: 360,
      arc: 'night',
      leftInArcSeconds: 1800,
    });
    // 340° is 5100 s: 5 min before the next sunrise at 5400 s
    expect(orbitStartOfPhase(340, arcs)).toMatchObject({
      event: 'sunrise',
      offsetSeconds: -300,
      arc: 'night',
    });
  });

  it('turns minutes after or before sunrise or sunset into the stored phase (worked by hand)', () => {
    expect(phaseOfOrbitStart({ event: 'sunrise', offsetSeconds: 12 * 60 }, arcs)).toBeCloseTo(48, 12);
    expect(phaseOfOrbitStart({ event: 'sunset', offsetSeconds: -12 * 60 }, arcs)).toBeCloseTo(168, 12);
    expect(phaseOfOrbitStart({ event: 'sunset', offsetSeconds: 6 * 60 }, arcs)).toBeCloseTo(240, 12);
    expect(phaseOfOrbitStart({ event: 'sunrise', offsetSeconds: -5 * 60 }, arcs)).toBeCloseTo(340, 12);
    // more than an orbit away wraps to the same place in the orbit
    expect(phaseOfOrbitStart({ event: 'sunrise', offsetSeconds: 5400 + 120 }, arcs)).toBeCloseTo(8, 9);
    expect(phaseOfOrbitStart({ event: 'sunrise', offsetSeconds: 0 }, arcs)).toBe(0);
    expect(() => phaseOfOrbitStart({ event: 'sunset', offsetSeconds: NaN }, arcs)).toThrow(RangeError);
  });

  it('with no shadow the phase is read from sunrise alone', () => {
    const noNight = orbitSummary({ altitudeKm: 400, betaDeg: 80 });
    const r = orbitStartOfPhase(90, noNight);
    expect(r).toMatchObject({ event: 'sunrise', arc: 'day', leftInArcSeconds: null });
    expect(r.offsetSeconds).toBeCloseTo(noNight.periodSeconds / 4, 9);
  });

  const orbit = fc.record({
    altitudeKm: fc.double({ min: 200, max: 1000, noNaN: true }),
    betaDeg: fc.double({ min: -60, max: 60, noNaN: true }),
  });
  const phase = fc.double({ min: 0, max: 359.999, noNaN: true });

  it('the reading is the day-night windows of the same start: its arc first, ending when they say (fast-check)', () => {
    fc.assert(
      fc.property(orbit, phase, (o, phaseAtStartDeg) => {
        const s = orbitSummary(o);
        const r = orbitStartOfPhase(phaseAtStartDeg, s);
        const [first] = dayNightWindows({ ...o, phaseAtStartDeg, durationSeconds: 2 * s.periodSeconds });
        expect(first.kind).toBe(r.arc);
        if (r.leftInArcSeconds !== null && r.leftInArcSeconds > 1e-3)
          expect(first.end).toBeCloseTo(r.leftInArcSeconds, 6);
      }),
    );
  });

  it('reading a phase and turning the reading back gives the phase (fast-check)', () => {
    fc.assert(
      fc.property(orbit, phase, (o, p) => {
        const s = orbitSummary(o);
        const back = phaseOfOrbitStart(orbitStartOfPhase(p, s), s);
        // the same place in the orbit: equal, or across the 0°/360° seam
        const gap = Math.abs(back - p);
        expect(Math.min(gap, 360 - gap)).toBeLessThan(1e-9);
      }),
    );
  });
});

describe('the start in words', () => {
  const arcs = { periodSeconds: 5400, sunlitSeconds: 3240, eclipseSeconds: 2160 };
  it('says whole minutes after or before the event, and what is left of the arc', () => {
    expect(orbitStartText(orbitStartOfPhase(48, arcs))).toBe('starts 12 min after orbital sunrise');
    expect(orbitStartText(orbitStartOfPhase(340, arcs))).toBe('starts 5 min before orbital sunrise');
    // 3.15 min before sunrise (worked by hand: 347.4° of 5400 s is 5211 s, 189 s before the end)
    expect(orbitStartText(orbitStartOfPhase(347.4, arcs))).toBe('starts 3 min before orbital sunrise');
    expect(orbitStartText({ event: 'sunset', offsetSeconds: -150 })).toBe(
      'starts 3 min before orbital sunset',
    );
    expect(orbitStartText({ event: 'sunset', offsetSeconds: 89 })).toBe('starts 1 min after orbital sunset');
    expect(orbitStartText({ event: 'sunset', offsetSeconds: 29 })).toBe('starts at orbital sunset');
    expect(orbitStartText({ event: 'sunrise', offsetSeconds: -31 })).toBe(
      'starts 1 min before orbital sunrise',
    );
    expect(orbitStartArcText(orbitStartOfPhase(8, arcs))).toBe('in daylight, sunset 52 min later');
    expect(orbitStartArcText(orbitStartOfPhase(240, arcs))).toBe('in night, sunrise 30 min later');
  });
});
