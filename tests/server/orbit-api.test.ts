import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(() => t.close());

const orbit = async (query: string) => (await t.agent('viewer')).get(`/api/orbit${query}`);

describe('GET /api/orbit', () => {
  it('400 km, β = 0: period 92.56 min (Kepler with WGS 84 μ and Rₑ) and 36.11 min eclipse (Sumanth 2019)', async () => {
    const res = await orbit('?altitudeKm=400&betaDeg=0');
    expect(res.status).toBe(200);
    expect(res.body.periodSeconds / 60).toBeCloseTo(92.56, 2);
    expect(res.body.periodSeconds).toBeGreaterThan(5553);
    expect(res.body.periodSeconds).toBeLessThan(5555);
    expect(res.body.eclipseSeconds / 60).toBeCloseTo(36.11, 2);
    expect(res.body.sunlitSeconds).toBeCloseTo(res.body.periodSeconds - res.body.eclipseSeconds, 9);
    expect(res.body.criticalBetaDeg).toBeCloseTo(70.22, 2);
  });

  it('400 km at β = 40° and 60°: 32.80 and 24.37 min of shadow; past β* no shadow (Sumanth 2019 eclipse formula)', async () => {
    expect((await orbit('?altitudeKm=400&betaDeg=40')).body.eclipseSeconds / 60).toBeCloseTo(32.8, 2);
    expect((await orbit('?altitudeKm=400&betaDeg=-60')).body.eclipseSeconds / 60).toBeCloseTo(24.37, 2);
    const sunlit = (await orbit('?altitudeKm=400&betaDeg=75')).body;
    expect(sunlit.eclipseSeconds).toBe(0);
    expect(sunlit.sunlitSeconds).toBe(sunlit.periodSeconds);
  });

  it.each([
    ['', 'both missing'],
    ['?altitudeKm=400', 'beta missing'],
    ['?altitudeKm=&betaDeg=0', 'empty altitude'],
    ['?altitudeKm=abc&betaDeg=0', 'not a number'],
    ['?altitudeKm=NaN&betaDeg=0', 'NaN'],
    ['?altitudeKm=Infinity&betaDeg=0', 'infinite'],
    ['?altitudeKm=50&betaDeg=0', 'below 100 km'],
    ['?altitudeKm=400&betaDeg=91', 'beta over 90'],
    ['?altitudeKm=400&betaDeg=-90.5', 'beta under -90'],
    ['?altitudeKm=400&betaDeg=0&betaDeg=10', 'repeated parameter'],
  ])('400 for %s (%s)', async (query) => {
    const res = await orbit(query);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('VALIDATION_FAILED');
  });

  it('needs a session', async () => {
    expect((await t.anonymous().get('/api/orbit?altitudeKm=400&betaDeg=0')).status).toBe(401);
  });
});
