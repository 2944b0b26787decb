import { findTextIssues, text, textProblem } from './text';

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
