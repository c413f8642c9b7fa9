import { describe, expect, it } from 'vitest';
import { rowIndexAfterKey } from '../../../../src/ui/features/corpus/row-keys';

describe('row focus moves', () => {
  it('moves by one, by a screen and to the ends, never outside the rows', () => {
    expect(rowIndexAfterKey('ArrowDown', 0, 5, 3)).toBe(1);
    expect(rowIndexAfterKey('ArrowDown', 4, 5, 3)).toBe(4);
    expect(rowIndexAfterKey('ArrowUp', 0, 5, 3)).toBe(0);
    expect(rowIndexAfterKey('PageDown', 1, 5, 3)).toBe(4);
    expect(rowIndexAfterKey('PageUp', 4, 5, 3)).toBe(1);
    expect(rowIndexAfterKey('PageUp', 4, 5, 0)).toBe(3);
    expect(rowIndexAfterKey('Home', 3, 5, 3)).toBe(0);
    expect(rowIndexAfterKey('End', 0, 100_000, 3)).toBe(99_999);
    expect(rowIndexAfterKey('a', 0, 5, 3)).toBeNull();
    expect(rowIndexAfterKey('ArrowDown', 0, 0, 3)).toBeNull();
  });
});
