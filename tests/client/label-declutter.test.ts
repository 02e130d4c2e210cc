import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { declutter, LABEL_PRIORITY, type LabelCandidate } from '@/components/scene/declutter';

const tag = (
  left: number,
  top: number,
  priority: number,
  depth = 10,
  extra: Partial<LabelCandidate> = {},
) => ({
  rect: { left, top, width: 60, height: 18 },
  priority,
  depth,
  ...extra,
});

describe('label declutter', () => {
  it('keeps the selected label over a node name drawn at the same spot, and the nearer of two equals', () => {
    expect(declutter([tag(100, 100, LABEL_PRIORITY.node), tag(110, 105, LABEL_PRIORITY.selected)])).toEqual([
      false,
      true,
    ]);
    expect(
      declutter([tag(100, 100, LABEL_PRIORITY.node, 30), tag(110, 105, LABEL_PRIORITY.node, 5)]),
    ).toEqual([false, true]);
    // apart, both are drawn
    expect(declutter([tag(0, 0, LABEL_PRIORITY.node), tag(0, 40, LABEL_PRIORITY.node)])).toEqual([
      true,
      true,
    ]);
  });

  it('keeps node names off a crew marker, but not the crew tags of the markers beside it', () => {
    const ev1 = {};
    const ev2 = {};
    const shape = (left: number, group: object) => ({
      rect: { left, top: 100, width: 14, height: 14 },
      priority: LABEL_PRIORITY.crew,
      depth: 10,
      obstacle: true,
      group,
    });
    const shown = declutter([
      shape(100, ev1),
      shape(104, ev2),
      tag(100, 80, LABEL_PRIORITY.crew, 10, { group: ev1 }),
      tag(100, 118, LABEL_PRIORITY.crew, 10, { group: ev2 }),
      tag(95, 98, LABEL_PRIORITY.node),
    ]);
    expect(shown).toEqual([true, true, true, true, false]);
  });

  it('never draws two labels that touch, and draws every label that touches no other (property)', () => {
    const candidate = fc.record({
      rect: fc.record({
        left: fc.integer({ min: 0, max: 400 }),
        top: fc.integer({ min: 0, max: 300 }),
        width: fc.integer({ min: 5, max: 120 }),
        height: fc.integer({ min: 5, max: 30 }),
      }),
      priority: fc.integer({ min: 0, max: 5 }),
      depth: fc.double({ min: 0, max: 100, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.array(candidate, { maxLength: 40 }), (cs) => {
        const shown = declutter(cs);
        const touch = (a: LabelCandidate['rect'], b: LabelCandidate['rect']) =>
          a.left < b.left + b.width + 2 &&
          b.left < a.left + a.width + 2 &&
          a.top < b.top + b.height + 2 &&
          b.top < a.top + a.height + 2;
        cs.forEach((a, i) =>
          cs.forEach((b, j) => {
            if (i < j && shown[i] && shown[j]) expect(touch(a.rect, b.rect)).toBe(false);
          }),
        );
        cs.forEach((a, i) => {
          if (cs.every((b, j) => i === j || !touch(a.rect, b.rect))) expect(shown[i]).toBe(true);
        });
        // the most important label is always drawn
        if (cs.length) {
          const best = cs.reduce(
            (m, c, i) =>
              c.priority < cs[m].priority || (c.priority === cs[m].priority && c.depth < cs[m].depth) ? i : m,
            0,
          );
          expect(shown[best]).toBe(true);
        }
      }),
    );
  });
});
