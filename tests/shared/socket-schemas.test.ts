import { describe, expect, it } from 'vitest';
import { ReachRequestSchema, SocketPlanRequestSchema } from '@shared/schemas/sockets';

describe('reach and socket-plan request schemas', () => {
  it('accepts a reach request and refuses extra keys, bad keys and non-finite numbers', () => {
    expect(ReachRequestSchema.safeParse({ socket: 'PB3-S1', target: [1, 2, 3] }).success).toBe(true);
    expect(ReachRequestSchema.safeParse({ socket: 'PB3-S1', target: [1, 2, 3], extra: 1 }).success).toBe(
      false,
    );
    expect(ReachRequestSchema.safeParse({ socket: '', target: [1, 2, 3] }).success).toBe(false);
    expect(ReachRequestSchema.safeParse({ socket: 'S', target: [1, 2, Infinity] }).success).toBe(false);
    expect(ReachRequestSchema.safeParse({ socket: 'S', target: [1, 2] }).success).toBe(false);
  });

  it('bounds the target count and the grid spacing', () => {
    const t = (n: number) => Array.from({ length: n }, () => [0, 0, 0]);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(1) }).success).toBe(true);
    expect(
      SocketPlanRequestSchema.safeParse({ targets: t(500), candidates: ['A', 'B'], gridSpacingM: 0.25 })
        .success,
    ).toBe(true);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(0) }).success).toBe(false);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(501) }).success).toBe(false);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(1), gridSpacingM: 0.2 }).success).toBe(false);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(1), gridSpacingM: 50.5 }).success).toBe(false);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(1), candidates: [] }).success).toBe(false);
    // an empty list with a grid: plan new sockets only, no existing ones
    expect(
      SocketPlanRequestSchema.safeParse({ targets: t(1), candidates: [], gridSpacingM: 1 }).success,
    ).toBe(true);
    expect(SocketPlanRequestSchema.safeParse({ targets: t(1), mode: 'fast' }).success).toBe(false);
  });
});
