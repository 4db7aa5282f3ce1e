import type { Code } from '../codes/api/get-codes';

/** Keys the viewer keeps for itself; a code cannot take them as its shortcut. */
export const RESERVED_KEYS = ['j', 'k', 'm', 'n', 'u', 't'] as const;

export const NAVIGATION_KEYS = [
  { keys: ['j', '→'], action: 'Next document' },
  { keys: ['k', '←'], action: 'Previous document' },
  { keys: ['m'], action: 'More like this document' },
  { keys: ['n'], action: 'Write a note' },
  { keys: ['u'], action: 'Undo the last removal' },
  { keys: ['t'], action: 'Switch page view and text' },
  { keys: ['Esc'], action: 'Back to the results' },
  { keys: ['?'], action: 'Show or hide this legend' },
] as const;

/**
 * The key that applies each active code: its own shortcut when the lead set one,
 * otherwise the digit of its place in the code set (1-9) when no other code has taken it.
 */
export function codeKeyMap(active: readonly Code[]): Map<string, Code> {
  const map = new Map<string, Code>();
  const usable = (key: string | null): key is string =>
    key !== null && !(RESERVED_KEYS as readonly string[]).includes(key) && !map.has(key);
  for (const code of active) if (usable(code.shortcut)) map.set(code.shortcut, code);
  const keyed = new Set(map.values());
  active.slice(0, 9).forEach((code, index) => {
    const digit = String(index + 1);
    if (!keyed.has(code) && usable(digit)) map.set(digit, code);
  });
  return map;
}

export function keyOfCode(map: Map<string, Code>, codeId: number): string | undefined {
  for (const [key, code] of map) if (code.id === codeId) return key;
  return undefined;
}

/** True when a key press belongs to a field (typing a note must never code a document). */
export function isTypingTarget(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  const tag = target.tagName;
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag === 'INPUT') {
    const type = (target as HTMLInputElement).type;
    return !['checkbox', 'radio', 'button', 'submit', 'reset'].includes(type);
  }
  return false;
}
