/**
 * Shapes of the stored records as the API returns them. The database tables (migrations/) hold the same
 * fields; reports and the review workflow read these types.
 */
import type { Design, Evaluation } from '@leadline/mechanics';

export type Severity = 'blocking' | 'warning' | 'info';

/** One rule's judgement of one revision. `ruleId` is the finding's id (acknowledgements name it). */
export interface Finding {
  readonly ruleId: string;
  readonly severity: Severity;
  /** The value the rule measured (SI, or a flag), and the limit it was held against */
  readonly measured: number | boolean | string | null;
  readonly limit: number | boolean | string | null;
  /** Unit of measured/limit for display ("Pa", "-", "N*m", ...); null for flags */
  readonly unit: string | null;
  /** What an engineer reads: what is wrong (or noteworthy) and why it matters */
  readonly message: string;
  /** Standard, handbook or "common practice" behind the limit; never empty */
  readonly basis: string;
  /** Evaluation path the finding is about, e.g. "stresses.body.vonMises" */
  readonly subject: string | null;
}

export type Verdict = 'blocked' | 'needs-acknowledgement' | 'clear';

export interface Actor {
  readonly id: string;
  readonly name: string;
}

export type ReviewState = 'submitted' | 'approved' | 'rejected' | 'superseded' | 'withdrawn';

export interface RevisionRecord {
  readonly id: string;
  readonly productId: string;
  readonly calculationId: string;
  readonly revision: number;
  readonly note: string | null;
  /** The design input exactly as submitted */
  readonly input: unknown;
  /** The same design in engine units */
  readonly normalized: Design;
  readonly evaluation: Evaluation;
  readonly findings: readonly Finding[];
  readonly verdict: Verdict;
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
  readonly author: Actor | null;
  readonly createdAt: string;
  readonly hash: string;
  readonly previousHash: string | null;
}

export type EventType =
  | 'product-registered'
  | 'calculation-opened'
  | 'revision-submitted'
  | 'comment'
  | 'approved'
  | 'rejected'
  | 'withdrawn'
  | 'calculation-reassigned';

export interface ProductEvent {
  readonly id: string;
  readonly productId: string;
  readonly seq: number;
  readonly type: EventType;
  readonly calculationId: string | null;
  readonly revisionId: string | null;
  readonly actor: Actor | null;
  /** Event payload: comment text and target, acknowledgements, ... */
  readonly data: Record<string, unknown>;
  readonly createdAt: string;
  readonly hash: string;
  readonly previousHash: string | null;
}
