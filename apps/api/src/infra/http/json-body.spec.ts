import { jsonDepthExceeds } from './json-body';

describe('jsonDepthExceeds', () => {
  it('counts nested objects and arrays, the outermost value as level 1', () => {
    expect(jsonDepthExceeds('{"a":[{"b":1}]}', 3)).toBe(false);
    expect(jsonDepthExceeds('{"a":[{"b":[]}]}', 3)).toBe(true);
    expect(jsonDepthExceeds('[]', 1)).toBe(false);
    expect(jsonDepthExceeds('1', 1)).toBe(false);
    // siblings do not add up: depth, not count
    expect(jsonDepthExceeds(`[${'[],'.repeat(1000)}[]]`, 2)).toBe(false);
  });

  it('ignores brackets inside strings, escaped quotes and backslashes included', () => {
    expect(jsonDepthExceeds('{"a":"[[[[{{{{"}', 1)).toBe(false);
    expect(jsonDepthExceeds('{"a":"x\\"[[[[","b":"\\\\"}', 1)).toBe(false);
    expect(jsonDepthExceeds('{"a":"\\\\","b":[[1]]}', 2)).toBe(true); // the string ends after an escaped backslash
  });

  it('scans a 3,000-deep body without recursion', () => {
    expect(jsonDepthExceeds('['.repeat(3000) + ']'.repeat(3000), 64)).toBe(true);
    expect(jsonDepthExceeds('['.repeat(64) + ']'.repeat(64), 64)).toBe(false);
  });
});
