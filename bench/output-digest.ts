/**
 * A digest of what the engine and the rules answer for a few thousand generated designs, for refactoring the hot path
 * (docs/performance.md): run it before and after a change meant to be invisible (`npm run build` then
 * `node dist/bench/output-digest.js`); the same digest means every normalized design, evaluation (trace included,
 * key order included) and finding is byte-identical. The designs vary the test fixtures' size, starts, tolerance class,
 * load, nut length, duty, speed, brake and column length from a fixed seed; those the contract refuses are skipped.
 * Not a test: an intended change of any output changes the digest.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { DEFAULT_RULE_SET, judgeWithChecks } from '@leadline/rules';

type Json = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

const root = join(__dirname, '../..');
const bases: Json[] = ['trapezoidal-jack.json', 'trapezoidal-jack-clear.json'].map((f) => JSON.parse(readFileSync(join(root, 'test/fixtures/ok', f), 'utf8')));

let seed = Number(process.env.DIGEST_SEED ?? 20261202);
/** Linear congruential generator (glibc constants): the same designs on every machine. */
const random = () => {
  seed = (seed * 1103515245 + 12345) % 2147483648;
  return seed / 2147483648;
};
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(random() * xs.length)];

function generated(): Json {
  const d: Json = JSON.parse(JSON.stringify(pick(bases)));
  if (random() < 0.7) d.thread = { form: 'trapezoidal', size: pick(['Tr 12x3', 'Tr 24x5', 'Tr 32x6', 'Tr 40x7', 'Tr 60x9', 'Tr 100x12']), starts: d.thread.starts };
  if (random() < 0.4) d.thread.starts = pick([1, 2, 3]);
  if (random() < 0.2) d.thread.toleranceClass = '7H/7e';
  d.load.axial = pick(['500 N', '5 kN', '18 kN', '60 kN', '200 kN']);
  if (random() < 0.3) d.load.sense = pick(['compression', 'tension']);
  d.nut.length = pick(['15 mm', '40 mm', '60 mm', '150 mm']);
  d.duty.kind = pick(['lifting', 'positioning', 'clamping']);
  d.duty.speed = pick(['5 rpm', '60 rpm', '300 rpm', '2000 rpm']);
  d.duty.brake = random() < 0.5;
  if (d.duty.brake && random() < 0.6) d.duty.brakeTorque = pick(['2 N*m', '40 N*m', '500 N*m']);
  if (d.duty.brake && random() < 0.3) d.duty.brakeLocation = pick(['screw', 'motor']);
  if (random() < 0.3) d.screw.unsupportedLength = pick(['100 mm', '800 mm', '3000 mm']);
  return d;
}

const n = Number(process.env.DIGEST_DESIGNS ?? 4000);
const hash = createHash('sha256');
const byRule: Record<string, number> = {};
let accepted = 0;
for (let i = 0; i < n; i++) {
  const parsed = parseDesign(generated());
  if (!parsed.success) continue;
  accepted++;
  const evaluation = evaluate(parsed.design);
  // As the evaluation route judges: findings, the declared checks and the governing check
  const { findings, checks, governing } = judgeWithChecks(parsed.design, evaluation, DEFAULT_RULE_SET);
  for (const f of findings) byRule[f.ruleId] = (byRule[f.ruleId] ?? 0) + 1;
  hash.update(JSON.stringify(parsed.design)).update('\n').update(JSON.stringify(evaluation)).update('\n').update(JSON.stringify(findings)).update('\n');
  hash.update(JSON.stringify(checks)).update('\n').update(JSON.stringify(governing)).update('\n');
}
console.log(JSON.stringify({ generated: n, accepted, findingsByRule: byRule, digest: hash.digest('hex') }));
