/**
 * A decision's electronic signature as it is shown (API, pages, reports): who signed by printed name, the meaning,
 * the date and time with its UTC offset, the method and a short fingerprint (21 CFR 11.50: printed name, date and
 * time, meaning; 11.70: linked to its record by the revision hash inside the chained decision event).
 */

/** What a signature means, by decision. */
export const SIGNATURE_MEANING = { approved: 'approved as checking engineer', rejected: 'rejected as checking engineer' } as const;

/** How each method is named on a report. */
export const SIGNATURE_METHOD_LABELS: Readonly<Record<string, string>> = {
  password: 'password, given again at signing',
  oidc: 'identity provider, fresh login at signing',
  passkey: 'passkey, used at signing over the record hash',
};

/** A decision's signature as the API and the reports show it. */
export interface Signature {
  signerId: string;
  printedName: string;
  meaning: string;
  method: string;
  /** Hash of the signed revision's record: the signature belongs to that record only */
  revisionHash: string;
  /** Date and time of signing with its UTC offset (the decision event's database time) */
  signedAt: string;
  /** First 16 hex digits of the decision event's link hash, which covers the signature fields */
  fingerprint: string;
}

/** A decision event's signature for display (null for decisions recorded before signatures). */
export function signatureOf(data: unknown, createdAt: string | null, hash: string | null): Signature | null {
  const sig = (data as { signature?: Omit<Signature, 'signedAt' | 'fingerprint'> } | null)?.signature;
  if (!sig || !createdAt || !hash) return null;
  return { ...sig, signedAt: createdAt.replace(/Z$/, '+00:00'), fingerprint: hash.slice(0, 16) };
}
