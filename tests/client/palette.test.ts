import { describe, expect, it } from 'vitest';
import { palette } from '../../tailwind.config';

// WCAG 2.1 "relative luminance" and "contrast ratio" definitions (W3C Recommendation, 2018)
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);
  const lin = (c: number) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

const WHITE = '#ffffff';
const AA_TEXT = 4.5;

describe('contrast ratio (WCAG 2.1 formula)', () => {
  it('matches the published extremes and the common-practice threshold grey', () => {
    expect(contrast('#000000', WHITE)).toBeCloseTo(21, 5);
    expect(contrast(WHITE, WHITE)).toBeCloseTo(1, 5);
    // #767676 on white is commonly cited as the lightest grey that passes AA (4.54:1); #777777 fails (4.48:1)
    expect(contrast('#767676', WHITE)).toBeGreaterThanOrEqual(AA_TEXT);
    expect(contrast('#777777', WHITE)).toBeLessThan(AA_TEXT);
  });
});

describe('Tetherwise palette text pairs reach 4.5:1', () => {
  const pairs: Array<[string, string, string]> = [
    ['strong text on page', palette.text.strong, palette.surface.page],
    ['body text on panel', palette.text.DEFAULT, palette.surface.panel],
    ['muted text on page', palette.text.muted, palette.surface.page],
    ['muted text on sunken', palette.text.muted, palette.surface.sunken],
    ['accent link on panel', palette.accent.DEFAULT, palette.surface.panel],
    ['accent link on page', palette.accent.DEFAULT, palette.surface.page],
    ['white on accent button', WHITE, palette.accent.DEFAULT],
    ['accent strong on accent soft', palette.accent.strong, palette.accent.soft],
    ['draft badge', palette.status.draft, palette.status['draft-soft']],
    ['in-review badge', palette.status.review, palette.status['review-soft']],
    ['approved badge', palette.status.approved, palette.status['approved-soft']],
    ['danger text on danger soft', palette.danger.DEFAULT, palette.danger.soft],
    ['danger text on panel', palette.danger.DEFAULT, palette.surface.panel],
    ['white on danger button', WHITE, palette.danger.DEFAULT],
    ['caution text on caution soft', palette.caution.DEFAULT, palette.caution.soft],
    ['app bar text', palette.ink[100], palette.ink[900]],
    ['app bar muted text', palette.ink[300], palette.ink[900]],
    ['muted text on sign-in side', palette.ink[300], palette.ink[950]],
    ['active nav item', WHITE, palette.ink[700]],
  ];

  it.each(pairs)('%s', (_name, foreground, background) => {
    expect(contrast(foreground, background)).toBeGreaterThanOrEqual(AA_TEXT);
  });
});
