/**
 * The browser's presentation module is the server's: the generated ES module, run in an empty context of its own,
 * prints exactly what the server prints. The display factors agree with the engine's units library, which parses
 * the same units on input (one set of definitions: NIST SP 811, 2008, B.8).
 */
import { runInNewContext } from 'node:vm';
import { fromSi } from '@leadline/mechanics';
import { browserModuleSource } from './browser-module';
import * as server from './presentation';

/** The module's exports, evaluated with nothing from outside it (exports turned into plain declarations). */
function loadBrowserModule(): Record<string, unknown> {
  const source = browserModuleSource();
  const names = Object.keys(server);
  const body = `${source.replace(/^export /gm, '').replace(/^const exports = /m, 'var exports = ')}\n({ ${names.join(', ')} })`;
  return runInNewContext(body, {}) as Record<string, unknown>;
}

describe('the browser presentation module', () => {
  const browser = loadBrowserModule();
  type F = (...args: unknown[]) => unknown;
  const call = (name: string, ...args: unknown[]) => (browser[name] as F)(...args);

  it('exports every function and word table of the server module', () => {
    expect(Object.keys(browser).sort()).toEqual(Object.keys(server).sort());
    expect(browser.STATES).toEqual(server.STATES);
    expect(browser.VERDICTS).toEqual(server.VERDICTS);
    expect(browser.DISPLAY_UNITS).toEqual(server.DISPLAY_UNITS);
  });

  it('prints numbers, quantities, words and dates exactly as the server does', () => {
    const numbers = [0, 1, -57.041, 9.9996, 0.00009304, 2.07e11, 173.976, Number.NaN, 12345.678];
    for (const x of numbers) {
      expect(call('sig', x)).toBe(server.sig(x));
      expect(call('messageNumber', x)).toBe(server.messageNumber(x));
      expect(call('siRecord', x)).toBe(server.siRecord(x));
    }
    expect(call('messagePair', 2.9996, 3)).toEqual(server.messagePair(2.9996, 3));
    for (const system of ['SI', 'US'] as const) {
      for (const kind of Object.keys(server.DISPLAY_UNITS.SI) as server.QuantityKind[]) {
        expect(call('formatQuantity', 1234.5678, kind, system)).toBe(server.formatQuantity(1234.5678, kind, system));
      }
    }
    expect(call('formatQuantity', null, 'torque', 'SI')).toBe('—');
    expect(call('wordFor', server.STATES, 'rejected')).toBe('Rejected');
    expect(call('countOf', 2, 'warning')).toBe('2 warnings');
    expect(call('formatDate', '2026-03-01T09:12:44.123456Z')).toBe(server.formatDate('2026-03-01T09:12:44.123456Z'));
    expect(call('formatTime', '2026-03-01T09:12:44.123456Z')).toBe('2026-03-01 09:12:44');
  });
});

describe('display units', () => {
  // Each kind's display unit as the engine's units library spells it (libs/mechanics units.ts)
  const ENGINE: Partial<Record<server.QuantityKind, [string, Parameters<typeof fromSi>[2]]>> = {
    length: ['mm', 'length'], force: ['kN', 'force'], stress: ['MPa', 'stress'], pressure: ['MPa', 'stress'], modulus: ['GPa', 'stress'],
    torque: ['N*m', 'torque'], travelSpeed: ['m/min', 'linearSpeed'], pv: ['MPa*m/s', 'pv'], serviceTime: ['h', 'serviceTime'],
    specificWearRate: ['mm^3/(N*m)', 'specificWearRate'],
  };
  const ENGINE_US: Partial<Record<server.QuantityKind, [string, Parameters<typeof fromSi>[2]]>> = {
    length: ['in', 'length'], force: ['lbf', 'force'], stress: ['ksi', 'stress'], pressure: ['psi', 'stress'], modulus: ['Mpsi', 'stress'],
    torque: ['lbf*in', 'torque'], travelSpeed: ['in/min', 'linearSpeed'], slidingSpeed: ['ft/min', 'linearSpeed'], pv: ['psi*ft/min', 'pv'],
    density: ['lb/in^3', 'density'], serviceTime: ['h', 'serviceTime'], specificWearRate: ['in^3/(lbf*in)', 'specificWearRate'],
  };
  it.each([
    ['SI', ENGINE],
    ['US', ENGINE_US],
  ] as const)('%s factors equal the engine units library', (system, table) => {
    for (const [kind, [unit, dimension]] of Object.entries(table) as [server.QuantityKind, [string, Parameters<typeof fromSi>[2]]][]) {
      expect({ kind, factor: server.toDisplay(1, kind, system) / fromSi(1, unit, dimension) }).toEqual({ kind, factor: expect.closeTo(1, 12) });
    }
  });

  // A temperature has an offset as well as a factor: held to the units library at the two fixed points of water
  it.each([
    ['SI', 'degC'],
    ['US', 'degF'],
  ] as const)('%s temperatures equal the engine units library (273.15 K and 373.15 K)', (system, unit) => {
    for (const kelvin of [273.15, 373.15]) {
      expect(server.toDisplay(kelvin, 'temperature', system)).toBeCloseTo(fromSi(kelvin, unit, 'temperature'), 9);
    }
  });
});
