/**
 * The calculation report's input and view types, and the caution it prints: what every section view model fills and the templates print.
 */
import type { Actor, ProductEvent, ReviewState, RevisionRecord, Severity, Verdict } from '@leadline/contracts';
import { type UnitSystem } from '@leadline/presentation';
import { type Check } from '@leadline/rules';

// ---------------------------------------------------------------------------------------------------------
// Input

export interface ReportHistoryEntry {
  readonly id: string;
  readonly revision: number;
  readonly createdAt: string;
  readonly verdict: Verdict;
  readonly state: ReviewState;
  readonly author: Actor | null;
}

export interface ReportInput {
  readonly product: { readonly id: string; readonly code: string; readonly name: string; readonly description?: string | null };
  readonly calculation: { readonly id: string; readonly title: string };
  readonly revision: RevisionRecord;
  readonly state: ReviewState;
  readonly reviewer: Actor | null;
  readonly decidedAt: string | null;
  /** Events of this revision, chronological */
  readonly events: readonly ProductEvent[];
  /** All revisions of the calculation */
  readonly history: readonly ReportHistoryEntry[];
  /** Revisions of the calculation left out of `history`, before and after the window around this one */
  readonly omittedHistory?: { readonly before: number; readonly after: number } | null;
  /** Comments of this revision left out of `events` (the report prints comments in full only up to a bound) */
  readonly omittedComments?: { readonly count: number; readonly firstSeq: number; readonly lastSeq: number } | null;
  readonly generatedAt: string;
  /** The product chain's head signed at generatedAt (checkpoints module): what an auditor checks the record against */
  readonly checkpoint?: {
    readonly productId: string; readonly seq: number; readonly headHash: string; readonly time: string;
    readonly algorithm: string; readonly keyId: string; readonly signature: string;
  } | null;
  /**
   * The checks the rules declare, judged on this revision under the rule set it was judged by (judgeWithChecks /
   * checksOf): the factor table and the summary's governing check and lowest strength factor print these
   */
  readonly checks: readonly Check[];
}

// ---------------------------------------------------------------------------------------------------------
// View

/** Printed on the first page and again at the end; the PDF footer carries CAUTION_SHORT on every page. */
export const CAUTION_TEXT: readonly string[] = [
  'This calculation supports, and does not replace, the judgement of a qualified engineer who checks it against the actual design, its manufacture and its use.',
  'Lifting equipment must be designed, built, examined and used in accordance with the local codes and regulations and with licensed engineering practice.',
  'Self-locking is no substitute for a brake or load-holding device wherever a falling or running-back load can hurt someone.',
];
export const CAUTION_SHORT =
  'Supports, does not replace, a qualified engineer’s judgement. Lifting equipment: follow local codes and licensed practice. Self-locking is no substitute for a brake.';

export interface KeyValue {
  readonly label: string;
  readonly value: string;
  /** Optional note printed small beside the value */
  readonly note?: string;
  /** Value printed in a monospace face (hashes, ids) */
  readonly mono?: boolean;
}

export interface FindingRef {
  readonly ruleId: string;
  readonly severity: Severity;
}

export interface CalcLine {
  readonly path: string;
  readonly label: string;
  readonly formulaId: string;
  /** Symbol and equation as HTML-safe markup (escaped text with sub/sup) */
  readonly symbolHtml: string;
  readonly equationHtml: string;
  readonly source: string;
  /** "symbol = substituted = result", plain text */
  readonly substitution: string;
  /** The same as escaped HTML, the symbol with its subscripts */
  readonly substitutionHtml: string;
  /** Result number as printed, and its unit */
  readonly value: string;
  readonly unit: string;
  /** value + unit */
  readonly display: string;
  readonly findings: readonly FindingRef[];
}

/** A section's notes: the partial (templates/reports/sections/notes-<id>.hbs) that words them and the facts it prints. */
export interface SectionNotes {
  readonly partial: string;
  readonly facts: Readonly<Record<string, unknown>>;
}

export interface CalcSection {
  readonly id: string;
  readonly number: string;
  readonly title: string;
  readonly notes: SectionNotes | null;
  readonly lines: readonly CalcLine[];
  /** Which chart belongs under this section */
  readonly chart: 'torqueFriction' | 'column' | null;
}

export interface SafetyFactorRow {
  /** The check id */
  readonly key: string;
  readonly label: string;
  /** Few words, for the chart axis */
  readonly shortLabel: string;
  readonly path: string;
  readonly value: number | null;
  readonly limit: number;
  readonly limitKind: 'minimum' | 'maximum';
  readonly valueText: string;
  readonly limitText: string;
  readonly status: 'meets' | 'warning' | 'below' | 'not-computed';
  readonly statusText: string;
  /** The rule that declares the check and its limit */
  readonly limitFrom: string;
  readonly governing: boolean;
}

export interface CheckRow {
  readonly ruleId: string;
  readonly severity: Severity;
  readonly subject: string;
  readonly measured: string;
  readonly limit: string;
  /** measured / limit, when both are numbers */
  readonly ratio: string;
}

export interface FindingView {
  readonly ruleId: string;
  readonly severity: Severity;
  readonly message: string;
  readonly basis: string;
  readonly subject: string | null;
  readonly measured: string;
  readonly limit: string;
  readonly acknowledgedBy: string | null;
}

export interface FindingGroup {
  readonly severity: Severity;
  readonly title: string;
  readonly explanation: string;
  readonly findings: readonly FindingView[];
}

/** One decision's signature block (reviews/signature.ts). */
export interface SignatureView {
  readonly printedName: string;
  readonly meaning: string;
  readonly signedAt: string;
  /** signedAt split for print: the date, and the time with its offset */
  readonly signedDate: string;
  readonly signedTime: string;
  readonly method: string;
  readonly fingerprint: string;
  readonly revisionHash: string;
}

export interface EventView {
  readonly seq: number;
  readonly type: string;
  readonly typeLabel: string;
  readonly actor: string;
  readonly at: string;
  readonly text: string | null;
  /** What was said in the event, each with the input field (its label), the finding or the result (a check) it is on */
  readonly remarks: readonly {
    readonly kind: string; readonly text: string; readonly onField: string | null; readonly onFinding: string | null;
    readonly onResult: { readonly id: string; readonly label: string; readonly valueText: string | null; readonly limitText: string | null } | null;
  }[];
  /** The event is a signed decision (its signature block is printed with the signatures) */
  readonly signed: boolean;
  readonly details: readonly string[];
}

export interface HistoryRow {
  readonly revision: number;
  readonly createdAt: string;
  readonly author: string;
  readonly verdict: string;
  readonly state: string;
  readonly current: boolean;
}

export interface InputRow {
  readonly path: string;
  readonly value: string;
  readonly unit?: string;
  /** The field in words (the design input's declarations) */
  readonly label?: string;
}

export interface FrictionRow {
  readonly surface: string;
  readonly range: string;
  readonly sourceKind: string;
  readonly reference: string;
  readonly entry: string;
}

export interface MaterialRow {
  readonly part: string;
  readonly property: string;
  readonly value: string;
  readonly origin: string;
}

/** Section 3, basis and conventions: the prose is the template's; these are the facts of the revision it names. */
export interface ConventionsView {
  readonly system: UnitSystem;
  readonly screwMaterial: string | null;
  readonly shearYieldRatio: string;
}

export interface ReportView {
  readonly title: string;
  readonly unitSystem: UnitSystem;
  readonly unitSystemLabel: string;
  readonly caution: readonly string[];
  readonly cautionShort: string;
  readonly header: {
    readonly productCode: string;
    readonly productName: string;
    readonly productDescription: string | null;
    readonly calculationId: string;
    readonly calculationTitle: string;
    readonly revision: number;
    readonly revisionNote: string | null;
    readonly state: ReviewState;
    readonly stateLabel: string;
    readonly verdict: Verdict;
    readonly verdictLabel: string;
    readonly author: string;
    readonly reviewer: string;
    readonly decidedAt: string | null;
    readonly rows: readonly KeyValue[];
  };
  readonly summary: readonly KeyValue[];
  readonly findingCounts: { readonly blocking: number; readonly warning: number; readonly info: number };
  readonly input: {
    readonly asEntered: readonly InputRow[];
    readonly engineUnits: readonly InputRow[];
    readonly friction: readonly FrictionRow[];
    readonly materials: readonly MaterialRow[];
    readonly geometry: readonly KeyValue[];
  };
  readonly sections: readonly CalcSection[];
  readonly safetyFactors: readonly SafetyFactorRow[];
  readonly checks: readonly CheckRow[];
  readonly findingGroups: readonly FindingGroup[];
  readonly events: readonly EventView[];
  /** A signature block per decision of this revision, in chain order */
  readonly signatures: readonly SignatureView[];
  /** What the review record leaves out, and where the full trail is (null when it prints everything) */
  readonly eventsOmitted: string | null;
  readonly history: readonly HistoryRow[];
  /** What the revision history leaves out, and where the full list is (null when it lists every revision) */
  readonly historyOmitted: string | null;
  readonly conventions: ConventionsView;
  readonly record: readonly KeyValue[];
  /** The signed checkpoint printed under the record's hashes, or null when the report was built without one */
  readonly checkpoint: readonly KeyValue[] | null;
  readonly hash: string;
  readonly previousHash: string | null;
  readonly generatedAt: string;
  /** Label for the PDF page header */
  readonly headerLabel: string;
}

