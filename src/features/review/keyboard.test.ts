import { describe, expect, it } from 'vitest';
import { DEFAULT_CODES } from '@shared/schemas/codes';
import type { Code } from '../codes/api/get-codes';
import { codeKeyMap, keyOfCode } from './keyboard';

function code(id: number, name: string, shortcut: string | null, sortOrder = id): Code {
  return {
    id,
    name,
    shortcut,
    sortOrder,
    marksPrivileged: false,
    archivedAt: null,
    documentCount: 0,
    groupId: null,
    colour: 'slate',
  };
}

describe('viewer keys for codes', () => {
  it('gives the default code set its digits', () => {
    const codes = DEFAULT_CODES.map((c, i) => code(i + 1, c.name, c.shortcut));
    const map = codeKeyMap(codes);
    expect([...map].map(([key, c]) => `${key}:${c.name}`)).toEqual([
      '1:Responsive',
      '2:Not responsive',
      '3:Privileged',
      '6:Not privileged',
      '4:Hot',
      '5:Needs second look',
    ]);
  });

  it('uses a letter shortcut when set, else the place in the set, never a taken or reserved key', () => {
    const map = codeKeyMap([
      code(10, 'Responsive', 'r'),
      code(11, 'Hot', null),
      code(12, 'Confidential', '2'),
      code(13, 'Jump', 'j'),
    ]);
    expect(keyOfCode(map, 10)).toBe('r');
    // Hot's place (2) is Confidential's own key, so Hot has no key (its button still works).
    expect(keyOfCode(map, 11)).toBeUndefined();
    expect(keyOfCode(map, 12)).toBe('2');
    // j moves to the next document, so a code cannot take it; its place (4) is used instead.
    expect(keyOfCode(map, 13)).toBe('4');
    expect(map.has('j')).toBe(false);
  });
});
