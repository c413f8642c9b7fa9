import { describe, expect, it } from 'vitest';
import { exportFileName, fileNameSafe } from '../../../../src/ui/features/export/file-names';

describe('exportFileName', () => {
  const day = new Date(2025, 2, 4, 23, 59);

  it('names one file or each part with the local date and the format extension', () => {
    expect(exportFileName('Boiler jobs', 'iob2', 'all', day)).toBe('Boiler jobs-2025-03-04.iob2');
    expect(exportFileName('Boiler jobs', 'bioes', 'train', day)).toBe('Boiler jobs-2025-03-04-train.bioes');
    expect(exportFileName('Boiler jobs', 'jsonl', 'test', day)).toBe('Boiler jobs-2025-03-04-test.jsonl');
  });

  it('replaces characters unsafe in file names and never gives an empty name', () => {
    expect(fileNameSafe('a/b\\c:d*e?"f<g>h|i\u0007')).toBe('a_b_c_d_e_f_g_h_i_');
    expect(fileNameSafe('  ')).toBe('project');
    expect(fileNameSafe('Réparations 🔧')).toBe('Réparations 🔧');
  });
});
