/**
 * Re-checks a passkey signature stored with a decision, years later, with node:crypto alone (W3C Web Authentication
 * Level 2, §7.2 "Verifying an Authentication Assertion", steps 11-21 as far as they concern a stored assertion):
 * the client data is a `webauthn.get` over the challenge SHA-256(revision hash || nonce), so the signature belongs to
 * that revision only; the authenticator data names the relying party the passkey was registered for and says the
 * user was present and verified; and the signature over authenticatorData || SHA-256(clientDataJSON) verifies with
 * the signer's registered public key (COSE, RFC 9053). Pure: no I/O, no clock.
 */
import { createHash, createPublicKey, verify, type KeyObject } from 'node:crypto';
import { decodeCredentialPublicKey } from '@simplewebauthn/server/helpers';

/** The assertion a passkey decision stores (base64url fields as the browser gave them). */
export interface StoredAssertion {
  credentialId: string;
  /** base64url of the 32 random bytes mixed into the challenge */
  nonce: string;
  authenticatorData: string;
  clientDataJSON: string;
  signature: string;
}

/** The registered key of a passkey (passkey_credentials). */
export interface RegisteredPasskey {
  userId: string;
  /** COSE_Key as registered, base64url */
  publicKey: string;
  rpId: string;
}

const b64u = (text: string): Buffer => Buffer.from(text, 'base64url');
const sha256 = (...parts: Buffer[]): Buffer => {
  const h = createHash('sha256');
  for (const p of parts) h.update(p);
  return h.digest();
};

/** The challenge a signature over `revisionHash` is made on: SHA-256(revision hash as UTF-8 || nonce), base64url. */
export function signingChallenge(revisionHash: string, nonce: string): string {
  return sha256(Buffer.from(revisionHash, 'utf8'), b64u(nonce)).toString('base64url');
}

/** COSE key parameters (RFC 9052 §7.1, RFC 9053 §7.1-7.2): kty 1 OKP, 2 EC2, 3 RSA. */
function keyOf(cose: string): { key: KeyObject; alg: number } {
  const m = decodeCredentialPublicKey(new Uint8Array(b64u(cose))) as unknown as Map<number, number | Uint8Array>;
  const bytes = (label: number) => Buffer.from(m.get(label) as Uint8Array).toString('base64url');
  const kty = m.get(1);
  const alg = Number(m.get(3));
  if (kty === 2) {
    const crv = ({ 1: 'P-256', 2: 'P-384', 3: 'P-521' } as Record<number, string>)[Number(m.get(-1))];
    return { key: createPublicKey({ key: { kty: 'EC', crv, x: bytes(-2), y: bytes(-3) }, format: 'jwk' }), alg };
  }
  if (kty === 3) return { key: createPublicKey({ key: { kty: 'RSA', n: bytes(-1), e: bytes(-2) }, format: 'jwk' }), alg };
  if (kty === 1) return { key: createPublicKey({ key: { kty: 'OKP', crv: 'Ed25519', x: bytes(-2) }, format: 'jwk' }), alg };
  throw new Error(`COSE key type ${String(kty)} is not supported`);
}

/** The hash of a COSE algorithm (RFC 9053 §2.1, -7 ES256, -35 ES384, -36 ES512, -257 RS256, -8 EdDSA). */
const HASH_OF: Record<number, string | null> = { [-7]: 'sha256', [-35]: 'sha384', [-36]: 'sha512', [-257]: 'sha256', [-8]: null };

/**
 * Why a stored passkey assertion does not prove the signature on `revisionHash` by `key`, or null when it does.
 */
export function passkeySignatureProblem(assertion: StoredAssertion, key: RegisteredPasskey, revisionHash: string): string | null {
  let client: { type?: string; challenge?: string };
  try {
    client = JSON.parse(b64u(assertion.clientDataJSON).toString('utf8'));
  } catch {
    return 'the passkey signature\'s client data is not JSON';
  }
  if (client.type !== 'webauthn.get') return 'the passkey signature\'s client data is not an assertion';
  if (client.challenge !== signingChallenge(revisionHash, assertion.nonce)) return 'the passkey signature was made over another record';
  const auth = b64u(assertion.authenticatorData);
  if (auth.length < 37) return 'the passkey signature\'s authenticator data is too short';
  if (!auth.subarray(0, 32).equals(sha256(Buffer.from(key.rpId, 'utf8')))) return 'the passkey signature names another relying party';
  // flags (WebAuthn §6.1): bit 0 user present, bit 2 user verified
  if ((auth[32] & 0x05) !== 0x05) return 'the passkey signature was made without user verification';
  let ok = false;
  try {
    const { key: publicKey, alg } = keyOf(key.publicKey);
    const hash = HASH_OF[alg];
    if (hash === undefined) return `the passkey's algorithm ${alg} is not supported`;
    const signed = Buffer.concat([auth, sha256(b64u(assertion.clientDataJSON))]);
    ok = verify(hash, signed, publicKey.asymmetricKeyType === 'ec' ? { key: publicKey, dsaEncoding: 'der' } : publicKey, b64u(assertion.signature));
  } catch {
    ok = false;
  }
  return ok ? null : 'the passkey signature does not verify with the signer\'s registered public key';
}
