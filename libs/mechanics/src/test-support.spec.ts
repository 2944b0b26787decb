import { expectClose } from './test-support';

describe('expectClose (the shared tolerance helper must be able to fail)', () => {
  it('passes inside the relative tolerance and fails just outside it', () => {
    expect(() => expectClose(100.9, 100, { rtol: 0.01 })).not.toThrow();
    expect(() => expectClose(101.1, 100, { rtol: 0.01 })).toThrow(/within rtol 0.01 of 100/);
    expect(() => expectClose(-101.1, -100, { rtol: 0.01 })).toThrow();
  });

  it('adds the absolute tolerance, for values printed to a fixed number of decimals or near zero', () => {
    expect(() => expectClose(15.944, 15.94, { rtol: 0, atol: 0.005 })).not.toThrow();
    expect(() => expectClose(15.946, 15.94, { rtol: 0, atol: 0.005 })).toThrow();
    expect(() => expectClose(1e-13, 0, { rtol: 1e-9, atol: 1e-12 })).not.toThrow();
    expect(() => expectClose(1e-11, 0, { rtol: 1e-9, atol: 1e-12 })).toThrow();
  });

  it('never passes NaN or infinities, and names the compared quantity', () => {
    expect(() => expectClose(NaN, 1, { rtol: 1 })).toThrow(/finite/);
    expect(() => expectClose(Infinity, 1, { rtol: 1 })).toThrow(/finite/);
    expect(() => expectClose(1, NaN, { rtol: 1 })).toThrow(/finite/);
    expect(() => expectClose(2, 1, { rtol: 0.1, label: 'raise torque' })).toThrow(/^raise torque: /);
  });
});
