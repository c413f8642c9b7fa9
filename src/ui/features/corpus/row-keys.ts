/** Which row a key moves the focus to in the utterance table (null: the key is not a move). */
export function rowIndexAfterKey(key: string, index: number, count: number, pageRows: number): number | null {
  if (count === 0) return null;
  const clamp = (i: number) => Math.max(0, Math.min(count - 1, i));
  switch (key) {
    case 'ArrowDown':
      return clamp(index + 1);
    case 'ArrowUp':
      return clamp(index - 1);
    case 'PageDown':
      return clamp(index + Math.max(1, pageRows));
    case 'PageUp':
      return clamp(index - Math.max(1, pageRows));
    case 'Home':
      return 0;
    case 'End':
      return count - 1;
    default:
      return null;
  }
}
