/**
 * The calculation report as data: everything the template prints, already converted to the design's unit
 * system, rounded to engineering significant figures and laid out in reading order. Pure: the same input
 * gives the same view (generatedAt is an input), so the report of a stored revision can be reproduced.
 */
import type { Severity } from '@leadline/contracts';
import { formatDate, formatQuantity, STATES_IN_FULL, VERDICTS_IN_FULL, wordFor, type UnitSystem } from '@leadline/presentation';
import { governingCheck } from '@leadline/rules';
import { CAUTION_SHORT, CAUTION_TEXT, type InputRow, type KeyValue, type ReportInput, type ReportView } from './report-view';
import { buildSections } from './sections/calculation';
import { actorName, buildEvents, buildSignatures } from './sections/review';
import { buildChecks, buildFindingGroups, buildSafetyFactors } from './sections/checks';
import { engineValueRows, flatten, frictionRows, geometryRows, inputLabel, materialRows } from './sections/inputs';

import { buildSummary, conventionsOf } from './sections/summary';

export { mathHtml, mathText, pathHtml } from './markup';
export * from './report-view';

// ---------------------------------------------------------------------------------------------------------
// The view

/** The screw on page 1: its standard size, or form, major diameter and pitch, and the number of starts. */
function screwSize(g: ReportInput['revision']['evaluation']['geometry'], system: UnitSystem): string {
  const L = (si: number) => formatQuantity(si, 'length', system);
  const size = g.size ?? `${g.form} ${L(g.majorDiameter)} × ${L(g.pitch)}`;
  return `${size}, ${g.starts} start${g.starts === 1 ? '' : 's'}`;
}

/** The signatures in one line for the title block (the full block is in the review record). */
function signatureLine(signatures: readonly { printedName: string; meaning: string; signedAt: string }[]): string {
  return signatures.length === 0 ? 'none yet' : signatures.map((s) => `${s.printedName}, ${s.meaning.toLowerCase()}, ${s.signedAt}`).join('; ');
}

/** Prepares everything the calculation report prints. */
export function buildReportView(input: ReportInput): ReportView {
  const { revision, product, calculation } = input;
  const design = revision.normalized;
  const e = revision.evaluation;
  const system: UnitSystem = design.unitSystem === 'US' ? 'US' : 'SI';
  const findings = revision.findings;
  const governing = governingCheck(input.checks);
  const factors = buildSafetyFactors(input.checks, system).map((f) => (governing !== null && f.key === governing.id ? { ...f, governing: true } : f));
  const count = (s: Severity) => findings.filter((f) => f.severity === s).length;
  const title = `Calculation report: ${calculation.title}`;
  const headerRows: KeyValue[] = [
    { label: 'Product', value: `${product.code}, ${product.name}` },
    { label: 'Calculation', value: calculation.title, note: calculation.id },
    { label: 'Revision', value: String(revision.revision), note: revision.note ?? undefined },
    { label: 'Screw size', value: screwSize(e.geometry, system) },
    { label: 'Review state', value: wordFor(STATES_IN_FULL, input.state) },
    { label: 'Verdict of the rules', value: wordFor(VERDICTS_IN_FULL, revision.verdict) },
    { label: 'Author', value: actorName(revision.author) },
    { label: 'Submitted', value: formatDate(revision.createdAt) },
    { label: 'Reviewer', value: actorName(input.reviewer) },
    { label: 'Decided', value: formatDate(input.decidedAt) },
    { label: 'Signatures', value: signatureLine(buildSignatures(input.events)) },
    { label: 'Report generated', value: formatDate(input.generatedAt) },
    { label: 'Record hash', value: revision.hash, mono: true },
  ];
  return {
    title,
    unitSystem: system,
    unitSystemLabel: system === 'SI' ? 'SI (metric)' : 'US customary',
    caution: CAUTION_TEXT,
    cautionShort: CAUTION_SHORT,
    header: {
      productCode: product.code,
      productName: product.name,
      productDescription: product.description ?? null,
      calculationId: calculation.id,
      calculationTitle: calculation.title,
      revision: revision.revision,
      revisionNote: revision.note,
      state: input.state,
      stateLabel: wordFor(STATES_IN_FULL, input.state),
      verdict: revision.verdict,
      verdictLabel: wordFor(VERDICTS_IN_FULL, revision.verdict),
      author: actorName(revision.author),
      reviewer: actorName(input.reviewer),
      decidedAt: input.decidedAt ? formatDate(input.decidedAt) : null,
      rows: headerRows,
    },
    summary: buildSummary(design, e, system, input.checks, factors, revision.engineVersion),
    findingCounts: { blocking: count('blocking'), warning: count('warning'), info: count('info') },
    input: {
      asEntered: (() => {
        const rows: InputRow[] = [];
        flatten(revision.input, '', rows);
        return rows.map((r) => ({ ...r, label: inputLabel(r.path) }));
      })(),
      engineUnits: engineValueRows(design, system),
      friction: frictionRows(design),
      materials: materialRows(design, revision.input, system),
      geometry: geometryRows(e, system, revision.engineVersion),
    },
    sections: buildSections(design, e, system, findings),
    safetyFactors: factors,
    checks: buildChecks(findings, system),
    findingGroups: buildFindingGroups(findings, input.events, system),
    events: buildEvents(input.events, factors),
    signatures: buildSignatures(input.events),
    historyOmitted: input.omittedHistory
      ? `Listed: the revisions around this one. Not listed: ${input.omittedHistory.before} earlier and ${input.omittedHistory.after} later ` +
        `revision${input.omittedHistory.before + input.omittedHistory.after === 1 ? '' : 's'}; every revision is in GET /api/v1/calculations/${calculation.id}/revisions.`
      : null,
    eventsOmitted: input.omittedComments
      ? `${input.omittedComments.count} further comment${input.omittedComments.count === 1 ? '' : 's'} on this revision (chain links ${input.omittedComments.firstSeq} to ${input.omittedComments.lastSeq}) ` +
        `are not printed here; every decision and acknowledgement above is. The full review trail, with every comment, is the product's audit ` +
        `download: GET /api/v1/products/${product.id}/audit (JSON, or ?format=csv), checked against the hash chain by GET /api/v1/products/${product.id}/verify.`
      : null,
    history: [...input.history]
      .sort((a, b) => a.revision - b.revision)
      .map((h) => ({
        revision: h.revision,
        createdAt: formatDate(h.createdAt),
        author: actorName(h.author),
        verdict: wordFor(VERDICTS_IN_FULL, h.verdict),
        state: wordFor(STATES_IN_FULL, h.state),
        current: h.id === revision.id,
      })),
    conventions: conventionsOf(design, system),
    record: [
      { label: 'Revision record id', value: revision.id, mono: true },
      { label: 'Record hash', value: revision.hash, mono: true },
      { label: 'Previous record hash', value: revision.previousHash ?? 'none (first record of the chain)', mono: revision.previousHash !== null },
      { label: 'Engine version', value: revision.engineVersion },
      { label: 'Rule set version', value: revision.ruleSetVersion },
      { label: 'Unit system of the input', value: system === 'SI' ? 'SI (metric)' : 'US customary' },
    ],
    checkpoint: input.checkpoint
      ? [
          { label: 'Chain link', value: `${input.checkpoint.seq} of product ${input.checkpoint.productId}`, mono: true },
          { label: 'Chain head hash', value: input.checkpoint.headHash, mono: true },
          { label: 'Signed at', value: input.checkpoint.time, mono: true },
          { label: 'Signing key', value: `${input.checkpoint.algorithm} ${input.checkpoint.keyId}`, mono: true },
          { label: 'Signature', value: input.checkpoint.signature, mono: true },
        ]
      : null,
    hash: revision.hash,
    previousHash: revision.previousHash,
    generatedAt: formatDate(input.generatedAt),
    headerLabel: `${product.code} · ${calculation.title} (${calculation.id}) · revision ${revision.revision}`,
  };
}
