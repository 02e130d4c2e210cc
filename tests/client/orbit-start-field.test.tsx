import { describe, expect, it } from 'vitest';
import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { OrbitStartField } from '@/features/plans/components/orbit-start-field';

// a 90 min orbit with 36 min of night, worked by hand: sunset at 216°
const arcs = { periodSeconds: 5400, sunlitSeconds: 3240, eclipseSeconds: 2160 };

describe('the start in the orbit, read back to the minute', () => {
  it('shows a stored phase 3.15 min before sunrise as 3 min, and keeps tenths the planner types', async () => {
    const user = userEvent.setup();
    let committed: number | undefined;
    // 347.4° of 5400 s is 5211 s: 189 s (3.15 min) before the next sunrise
    render(<OrbitStartField value={347.4} arcs={arcs} readOnly={false} onCommit={(v) => (committed = v)} />);
    const minutes = screen.getByLabelText('Start: minutes');
    expect(minutes).toHaveProperty('value', '3');
    expect(screen.getByLabelText('Start: after or before')).toHaveProperty('value', 'before');
    expect(screen.getByLabelText('Start: orbit event')).toHaveProperty('value', 'sunrise');
    expect(screen.getByText('in night, sunrise 3 min later · phase 347.4°')).toBeTruthy();
    expect(committed, 'reading it back commits nothing').toBeUndefined();

    await user.clear(minutes);
    await user.type(minutes, '2.5');
    // 150 s before sunrise: 5250 s of 5400, 350°
    expect(committed).toBeCloseTo(350, 9);
    expect(minutes).toHaveProperty('value', '2.5');
  });
});
