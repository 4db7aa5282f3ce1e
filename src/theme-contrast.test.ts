import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

// Checks the theme's text colours against WCAG 2.2 contrast minimums, using the
// relative-luminance and contrast-ratio definitions of WCAG 2.2 (success criteria
// 1.4.3 "Contrast (Minimum)": 4.5:1 for text, and 1.4.11 "Non-text Contrast": 3:1 for
// focus indicators and control borders that identify a control).

const css = readFileSync(join(import.meta.dirname, 'styles.css'), 'utf8');

function token(name: string): string {
  const match = css.match(new RegExp(`--color-${name}:\\s*(#[0-9a-fA-F]{6})`));
  if (!match) throw new Error(`styles.css has no --color-${name}`);
  return match[1];
}

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

describe('theme contrast (WCAG 2.2 AA)', () => {
  it('matches the WCAG definition on known pairs', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrast('#777777', '#ffffff')).toBeCloseTo(4.48, 2); // common practice: #777 just fails AA
  });

  const textPairs: [string, string][] = [
    ['ink', 'paper'],
    ['ink', 'panel'],
    ['ink', 'sunk'],
    ['ink-muted', 'paper'],
    ['ink-muted', 'panel'],
    ['ink-muted', 'sunk'],
    ['ink-faint', 'paper'],
    ['ink-faint', 'panel'],
    ['ink-faint', 'sunk'],
    ['accent-strong', 'panel'],
    ['accent-strong', 'accent-soft'],
    ['danger', 'panel'],
    ['danger', 'danger-soft'],
    ['warn', 'warn-soft'],
    ['ok', 'ok-soft'],
    ['info', 'info-soft'],
  ];
  it.each(textPairs)('text %s on %s is at least 4.5:1', (fg, bg) => {
    expect(contrast(token(fg), token(bg))).toBeGreaterThanOrEqual(4.5);
  });

  it('white button text on the accent is at least 4.5:1', () => {
    expect(contrast('#ffffff', token('accent'))).toBeGreaterThanOrEqual(4.5);
  });

  it.each([['paper'], ['panel']])('the focus ring on %s is at least 3:1', (bg) => {
    expect(contrast(token('focus'), token(bg))).toBeGreaterThanOrEqual(3);
  });
});
