/**
 * The report's sections of the engine 1.2 groups: every traced figure of a lifting design with all the 1.2 inputs lands in
 * its group's section (none left to "Further results"), and a section whose figures could not be computed names what to give.
 */
import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { FULL_LIFTING_INPUT, JACK_INPUT } from '../../../../../libs/rules/src/testing/designs';
import { sectionNotesText } from '../report-renderer';
import { buildSections } from './calculation';

const sectionsOf = (input: unknown) => {
  const parsed = parseDesign(input as never);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const e = evaluate(parsed.design);
  return { e, sections: buildSections(parsed.design, e, 'SI', []) };
};

describe('report sections of the engine 1.2 groups', () => {
  it('a lifting design with every 1.2 input: each group has its section, nothing is left to "Further results"', () => {
    const { e, sections } = sectionsOf({ ...FULL_LIFTING_INPUT, duty: { ...FULL_LIFTING_INPUT.duty, dutyCycle: 0.2 } });
    const ids = sections.map((s) => s.id);
    for (const id of ['nut-body', 'safety-nut', 'operation', 'dynamics', 'fatigue', 'collar-bearing']) expect(ids).toContain(id);
    expect(ids).not.toContain('other');
    const operation = sections.find((s) => s.id === 'operation')!;
    expect(operation.title).toBe('Operation, duty cycle and heat');
    expect(operation.lines.map((l) => l.path)).toEqual(expect.arrayContaining(['operation.travelTime', 'operation.meanPowerLoss', 'thermal.temperatureRise']));
    expect(sectionNotesText(operation).join(' ')).toMatch(/Duty: stroke 300 mm, 10 cycles per hour, duty cycle 20(\.0)? %/);
    expect(operation.lines.every((l) => !/NaN|undefined/.test(l.display))).toBe(true);
    // every traced path is printed once
    expect(sections.flatMap((s) => s.lines.map((l) => l.path)).sort()).toEqual(Object.keys(e.trace).sort());
  });

  it('the jack without the 1.2 inputs: the nut body and fatigue sections say what to give', () => {
    const { sections } = sectionsOf(JACK_INPUT);
    const notes = (id: string) => sectionNotesText(sections.find((s) => s.id === id) ?? { notes: null }).join(' ');
    expect(notes('nut-body')).toMatch(/Not computed \(nutBody\): give nut\.outsideDiameter/);
    expect(notes('fatigue')).toMatch(/Not computed \(fatigue\): give duty\.cycles/);
    expect(notes('operation')).toMatch(/Not computed \(operation\.meanPowerLoss\)/);
  });
});
