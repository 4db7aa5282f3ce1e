import { describe, expect, it } from 'vitest';
import { CODE_COLOURS, DEFAULT_CODES } from '@shared/schemas/codes';

// Every chip colour pair against WCAG 2.2 SC 1.4.3 "Contrast (Minimum)": 4.5:1 for text,
// with WCAG's relative luminance and contrast ratio (as src/theme-contrast.test.ts does).

function luminance(hex: string): number {
  const channel = (offset: number) => {
    const value = parseInt(hex.slice(offset, offset + 2), 16) / 255;
    return value <= 0.04045 ? value / 12.92 : ((value + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * channel(1) + 0.7152 * channel(3) + 0.0722 * channel(5);
}

function contrast(a: string, b: string): number {
  const [high, low] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (high + 0.05) / (low + 0.05);
}

describe('code chip colours (WCAG 2.2 AA)', () => {
  it('the contrast function matches WCAG on known pairs', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrast('#777777', '#ffffff')).toBeCloseTo(4.48, 2); // common practice: #777 just fails AA
  });

  it.each(Object.entries(CODE_COLOURS))('%s text on its background is at least 4.5:1', (_n, c) => {
    expect(contrast(c.fg, c.bg)).toBeGreaterThanOrEqual(4.5);
  });

  it('Hot, Privileged and Responsive have different colours', () => {
    const colourOf = (name: string) => DEFAULT_CODES.find((c) => c.name === name)!.colour;
    expect(new Set(['Hot', 'Privileged', 'Responsive'].map(colourOf)).size).toBe(3);
  });
});
