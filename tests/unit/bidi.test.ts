import { describe, expect, it } from 'vitest';
import { dropUnclosedBidi, dropUnclosedBidiDeep } from '../../shared/text';

// Code points from the Unicode bidirectional algorithm, UAX #9 (table 1, explicit formatting characters).
const LRE = '\u202A';
const RLE = '\u202B';
const PDF = '\u202C';
const RLO = '\u202E';
const LRI = '\u2066';
const RLI = '\u2067';
const PDI = '\u2069';
const RLM = '\u200F';

describe('dropUnclosedBidi', () => {
  it('leaves text without bidirectional controls, right-to-left letters and marks, and balanced controls as they are', () => {
    for (const s of ['Mira Fenwick', 'غراب الليل', `a${RLM}b`, `a ${RLO}b${PDF} c`, `${RLI}x${PDI}`, `${LRI}${RLE}x${PDF}${PDI}`, '']) expect(dropUnclosedBidi(s)).toBe(s);
  });

  it('drops an override left open, so it cannot run past the end of the field', () => {
    expect(dropUnclosedBidi(`Mira${RLO}gpj.exe`)).toBe('Miragpj.exe');
    expect(dropUnclosedBidi(`${RLO}a${RLE}b`)).toBe('ab');
    expect(dropUnclosedBidi(`${RLO}a${RLE}b${PDF}c`)).toBe(`a${RLE}b${PDF}c`);
  });

  it('matches as UAX #9 does: a PDI also ends what was opened inside its isolate; a PDF does not close an isolate', () => {
    expect(dropUnclosedBidi(`${RLI}a${LRE}b${PDI}c`)).toBe(`${RLI}a${LRE}b${PDI}c`);
    expect(dropUnclosedBidi(`${LRI}a${RLO}b`)).toBe('ab');
    expect(dropUnclosedBidi(`${RLI}a${PDF}`)).toBe(`a${PDF}`);
    // Closers with nothing to close have no effect and stay.
    expect(dropUnclosedBidi(`a${PDF}${PDI}b`)).toBe(`a${PDF}${PDI}b`);
  });

  it('never makes a text longer', () => {
    for (const s of [`${RLO}`, `${RLO}${RLI}${LRE}`, `x${RLO}y${PDF}${RLO}`]) expect(dropUnclosedBidi(s).length).toBeLessThan(s.length);
  });

  it('walks request bodies: strings in objects and arrays; other values and kept keys untouched', () => {
    const date = new Date(0);
    expect(dropUnclosedBidiDeep({ name: `x${RLO}`, n: 3, ok: true, none: null, figures: [{ name: `y${LRI}` }], at: date })).toEqual({ name: 'x', n: 3, ok: true, none: null, figures: [{ name: 'y' }], at: date });
    expect(dropUnclosedBidiDeep({ password: `pw${RLO}`, name: `n${RLO}` }, (k) => k === 'password')).toEqual({ password: `pw${RLO}`, name: 'n' });
  });
});
