import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bayOf, faceOf, socketNameFor } from '@shared/compute/socket-names';
import type { Vec3 } from '@shared/schemas/station';

// two bays side by side along x, as the demo truss is laid out (worked by hand)
const bays = [
  { key: 'PB3', label: 'Port bay 3', center: [-20.5, 0, 0] as Vec3, size: [7, 3, 3] as Vec3 },
  { key: 'PB2', label: 'Port bay 2', center: [-13.5, 0, 0] as Vec3, size: [7, 3, 3] as Vec3 },
];

describe('socket names after their bay', () => {
  it('takes the bay the point is on and the next number that bay does not use', () => {
    const taken = new Set(['PB3-S01', 'PB3-S02', 'PB3-S03', 'PB3-S04', 'PB2-S01']);
    expect(socketNameFor({ position: [-20, 0, 1.5], normal: [0, 0, 1] }, bays, taken)).toEqual({
      key: 'PB3-S05',
      label: 'Port bay 3 zenith foot restraint socket (planned)',
    });
    // the key just given is taken now
    expect(socketNameFor({ position: [-19, -1.5, 0], normal: [0, -1, 0] }, bays, taken)).toEqual({
      key: 'PB3-S06',
      label: 'Port bay 3 aft foot restraint socket (planned)',
    });
    expect(socketNameFor({ position: [-12, 1.6, 0], normal: [0, 1, 0] }, bays, taken).key).toBe('PB2-S02');
  });

  it('a point off every bay goes to the nearest; no bays at all gives SKT-nnn', () => {
    expect(bayOf([-40, 0, 0], bays)?.key).toBe('PB3');
    expect(bayOf([0, 0, 5], bays)?.key).toBe('PB2');
    expect(socketNameFor({ position: [0, 0, 0], normal: [1, 0, 0] }, [], new Set(['SKT-001']))).toEqual({
      key: 'SKT-002',
      label: 'Planned starboard foot restraint socket',
    });
  });

  it('faces follow the station frame: +x starboard, +y fore, +z zenith', () => {
    expect([
      faceOf([1, 0, 0]),
      faceOf([-1, 0.2, 0]),
      faceOf([0, 1, 0]),
      faceOf([0.1, -1, 0]),
      faceOf([0, 0, 1]),
      faceOf([0, 0.3, -1]),
    ]).toEqual(['starboard', 'port', 'fore', 'aft', 'zenith', 'nadir']);
  });

  it('never gives a key already taken, whatever is taken', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1, max: 30 }), { maxLength: 20 }),
        fc.tuple(fc.double({ min: -30, max: 0, noNaN: true }), fc.constant(0), fc.constant(1.5)),
        (numbers, position) => {
          const taken = new Set(numbers.map((n) => `PB3-S${String(n).padStart(2, '0')}`));
          const before = new Set(taken);
          const { key } = socketNameFor({ position: position as Vec3, normal: [0, 0, 1] }, bays, taken);
          expect(before.has(key)).toBe(false);
          expect(taken.has(key)).toBe(true);
        },
      ),
    );
  });
});
