import { displayableName, findTextIssues, nameProblem, text, textProblem } from './text';

describe('storable text', () => {
  it('accepts well-formed Unicode, including astral characters (a surrogate pair)', () => {
    expect(textProblem('Ø 40 mm 🔩 μ')).toBeNull();
    expect(text().safeParse('\ud83d\udd29').success).toBe(true);
  });
  it('refuses NUL and each kind of unpaired surrogate', () => {
    expect(textProblem('a\u0000')).toMatch(/NUL/);
    for (const s of ['\ud800', 'x\ud800y', '\udc00', 'a\udc00\ud800b', '\ud83d']) expect(textProblem(s)).toMatch(/unpaired surrogate/);
    expect(text().safeParse('\u0000').success).toBe(false);
  });
  it('names every bad string and key by its dotted path', () => {
    expect(findTextIssues({ a: [{ b: 'ok' }, { b: '\u0000' }], ['k\ud800']: 1 }, 'design.')).toEqual([
      { path: 'design.a.1.b', message: expect.stringMatching(/NUL/) },
      { path: 'design.(key)', message: expect.stringMatching(/field name/) },
    ]);
    expect(findTextIssues('\u0000')).toEqual([{ path: '(body)', message: expect.any(String) }]);
    expect(findTextIssues(undefined)).toEqual([]);
  });
});

describe('names and codes (nameProblem)', () => {
  // Code points from Unicode Standard Annex #9 (bidirectional controls) and The Unicode Standard ch. 23.2 (layout controls)
  it('refuses every bidirectional control, naming the code point and position', () => {
    for (const cp of [0x061c, 0x200e, 0x200f, 0x202a, 0x202b, 0x202c, 0x202d, 0x202e, 0x2066, 0x2067, 0x2068, 0x2069]) {
      const ch = String.fromCodePoint(cp);
      expect(nameProblem(`ab${ch}c`)).toBe(`must not contain bidirectional control characters (found U+${cp.toString(16).toUpperCase().padStart(4, '0')} at position 3)`);
    }
  });
  it('refuses zero-width and invisible characters', () => {
    for (const cp of [0x200b, 0x200c, 0x200d, 0x2060, 0x2061, 0x2062, 0x2063, 0x2064, 0xfeff]) {
      expect(nameProblem(`x${String.fromCodePoint(cp)}`)).toMatch(/zero-width or invisible characters \(found U\+[0-9A-F]{4} at position 2\)/);
    }
  });
  it('accepts names in any script, with accents, digits and punctuation, and keeps the storable-text checks', () => {
    for (const s of ['Harrowgate lifting jack', 'Zahnstange Ø 40 – Baureihe 2', 'مكبس ١', 'プレス', 'CV-400']) expect(nameProblem(s)).toBeNull();
    expect(nameProblem('a\u0000')).toMatch(/NUL/);
    const ctx = { addIssue: jest.fn() } as unknown as Parameters<typeof displayableName>[1];
    displayableName('x\u202Ey', ctx);
    expect(ctx.addIssue).toHaveBeenCalledWith({ code: 'custom', message: expect.stringMatching(/U\+202E/) });
  });
});
