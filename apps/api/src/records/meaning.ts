/**
 * What a chain must mean, checked link by link in chain order (verify streams the links through `MeaningState`):
 * a revision's stored verdict follows from its stored findings and names a stored, valid rule set; a decision obeys the
 * review rules as they stood at its link: the decided revision is earlier in the chain, is the latest revision of its
 * calculation and undecided, the decider is a user on record, active and holding the reviewer role at the decision's time (identity events), is no admin, is not the author and did not act with
 * a token the author issued, and an approval has no blocking finding and acknowledges every warning; a withdrawal is
 * the author's, of the latest undecided revision. The same rules the service and the database functions enforce when
 * the links are written (reviews/reviews.service.ts, migrations/20261204230000); pure, no I/O.
 */
import type { Finding, Verdict } from '@leadline/contracts';
import { passkeySignatureProblem, type RegisteredPasskey, type StoredAssertion } from './passkey-signature';

/** The verdict a list of findings gives: blocked by any blocking finding, else needs-acknowledgement by any warning. */
export function verdictOf(findings: readonly Pick<Finding, 'severity'>[]): Verdict {
  if (findings.some((f) => f.severity === 'blocking')) return 'blocked';
  return findings.some((f) => f.severity === 'warning') ? 'needs-acknowledgement' : 'clear';
}

/** Facts from outside the chain that the rules read: users' roles, who issued a token, which rule sets are valid. */
export interface MeaningRules {
  /**
   * The deciding user of a decision event as the identity record stood at that event's time: their roles (the newest
   * role events before it) and whether they were active; null when the event's actor is no user on record
   */
  signerAt(eventId: string): { roles: readonly string[]; active: boolean } | null;
  tokenIssuer(tokenId: string): string | null | undefined;
  ruleSetValid(version: string): boolean;
  /** A registered passkey by credential id, with its registration time (TS_TEXT), or null */
  passkeyOf(credentialId: string): (RegisteredPasskey & { createdAt: string }) | null;
}

interface RevisionFacts {
  calculationId: string;
  revision: number;
  authorId: string | null;
  blocking: boolean;
  warnings: string[];
  closed: boolean;
  hash: string | null;
}

export interface MeaningLink {
  kind: 'revision' | 'event';
  id: string;
  type?: string;
  calculationId: string | null;
  revisionId?: string | null;
  revision?: number;
  verdict?: string;
  ruleSetVersion?: string;
  /** the stored findings' JSON text (revisions) */
  findings?: string;
  actorId: string | null;
  tokenId: string | null;
  data?: unknown;
  /** the link's hash (a decision's signature names its revision's) */
  hash?: string | null;
  /** the link's time (TS_TEXT) */
  createdAt?: string | null;
}

export class MeaningState {
  private readonly revisions = new Map<string, RevisionFacts>();
  private readonly latest = new Map<string, number>();

  constructor(private readonly rules: MeaningRules) {}

  /** The reason this link breaks the rules, or null. Links must be given in chain order. */
  check(l: MeaningLink): string | null {
    if (l.kind === 'revision') return this.revision(l);
    if (l.type === 'approved' || l.type === 'rejected' || l.type === 'withdrawn') return this.closing(l);
    return null;
  }

  private revision(l: MeaningLink): string | null {
    let findings: Finding[];
    try {
      findings = JSON.parse(l.findings ?? 'null') as Finding[];
    } catch {
      return 'the stored findings are not JSON';
    }
    if (!Array.isArray(findings)) return 'the stored findings are not a list';
    const expected = verdictOf(findings);
    if (l.verdict !== expected) return `the stored verdict "${l.verdict}" does not follow from the stored findings (${expected})`;
    if (!l.ruleSetVersion || !this.rules.ruleSetValid(l.ruleSetVersion)) return `the revision names rule set "${l.ruleSetVersion}", which is not stored as a valid rule set`;
    this.revisions.set(l.id, {
      calculationId: l.calculationId ?? '',
      revision: l.revision ?? 0,
      authorId: l.actorId,
      blocking: findings.some((f) => f.severity === 'blocking'),
      warnings: findings.filter((f) => f.severity === 'warning').map((f) => f.ruleId),
      closed: false,
      hash: l.hash ?? null,
    });
    this.latest.set(l.calculationId ?? '', Math.max(this.latest.get(l.calculationId ?? '') ?? 0, l.revision ?? 0));
    return null;
  }

  private closing(l: MeaningLink): string | null {
    const rev = l.revisionId ? this.revisions.get(l.revisionId) : undefined;
    if (!rev) return `the ${l.type} event names a revision that is not earlier in the chain`;
    if (rev.closed) return `the ${l.type} event decides revision ${rev.revision}, which was decided or withdrawn already`;
    if (this.latest.get(rev.calculationId) !== rev.revision) return `the ${l.type} event decides revision ${rev.revision}, which a newer revision had superseded`;
    if (l.type === 'withdrawn') {
      if (l.actorId !== rev.authorId) return `revision ${rev.revision} was withdrawn by someone other than its author`;
    } else {
      const signer = l.actorId ? this.rules.signerAt(l.id) : null;
      if (!signer) return `the ${l.type} event names a decider who is no user on record`;
      if (!signer.active) return `the ${l.type} event was made by a user who was deactivated at the time`;
      const roles = signer.roles;
      if (!roles.includes('reviewer')) return `the ${l.type} event was made by a user without the reviewer role`;
      if (roles.includes('admin')) return `the ${l.type} event was made by an admin identity`;
      if (rev.authorId !== null && l.actorId === rev.authorId) return `revision ${rev.revision} was decided by its own author`;
      if (rev.authorId !== null && l.tokenId && this.rules.tokenIssuer(l.tokenId) === rev.authorId) {
        return `revision ${rev.revision} was decided with a token its author issued`;
      }
      if (l.type === 'approved') {
        if (rev.blocking) return `revision ${rev.revision} was approved although it has blocking findings`;
        const acks = ((l.data as { acknowledgements?: { finding?: string; comment?: string }[] } | null)?.acknowledgements ?? []).filter(
          (a) => typeof a?.comment === 'string' && a.comment.trim() !== '',
        );
        const missing = rev.warnings.find((w) => !acks.some((a) => a.finding === w));
        if (missing) return `revision ${rev.revision} was approved without acknowledging warning "${missing}"`;
      }
      const unsigned = this.signatureProblem(l, rev);
      if (unsigned) return unsigned;
    }
    rev.closed = true;
    return null;
  }

  /**
   * A decision's signature (decisions recorded before signatures carry none): it names the decided revision's hash,
   * and a passkey signature verifies with the signer's own passkey, registered before the decision.
   */
  private signatureProblem(l: MeaningLink, rev: RevisionFacts): string | null {
    const sig = (l.data as { signature?: { method?: string; revisionHash?: string; passkey?: StoredAssertion } } | null)?.signature;
    if (!sig) return null;
    if (rev.hash !== null && sig.revisionHash !== rev.hash) return `the ${l.type} event's signature names another record than revision ${rev.revision}`;
    if (sig.method !== 'passkey') return null;
    const assertion = sig.passkey;
    if (!assertion || typeof assertion.credentialId !== 'string') return `the ${l.type} event's passkey signature carries no assertion`;
    const key = this.rules.passkeyOf(assertion.credentialId);
    if (!key) return `the ${l.type} event's passkey is not registered`;
    if (key.userId !== l.actorId) return `the ${l.type} event was signed with another person's passkey`;
    if (l.createdAt && key.createdAt > l.createdAt) return `the ${l.type} event was signed with a passkey registered after it`;
    const problem = passkeySignatureProblem(assertion, key, sig.revisionHash ?? '');
    return problem ? `the ${l.type} event: ${problem}` : null;
  }
}
