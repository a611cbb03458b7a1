import { describe, expect, it } from 'vitest';
import { matchesSearch, searchKey } from '../../shared/search';

describe('finding a tool by what people type', () => {
  it('when the code is typed without its hyphen, with a space or in lower case, then it still matches', () => {
    for (const typed of ['LPCVD3', 'lpcvd 3', 'lpcvd-3', 'Lpcvd_3', ' LPCVD - 3 '])
      expect(matchesSearch(typed, ['LPCVD-3', 'LPCVD tube 3'])).toBe(true);
  });
  it('when a bay name is typed, then the tools in that bay match', () => {
    expect(matchesSearch('thin film', ['DEP-01', 'E-beam evaporator', 'Thin-film bay'])).toBe(true);
  });
  it('when the text is not in any field, then nothing matches; empty text matches everything', () => {
    expect(matchesSearch('lpcvd 4', ['LPCVD-3', 'LPCVD tube 3'])).toBe(false);
    expect(matchesSearch('  ', ['x'])).toBe(true);
    expect(searchKey('A-b c_d.e')).toBe('abcde');
  });
});
