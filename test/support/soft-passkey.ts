/**
 * A software passkey for HTTP tests that need no browser: a P-256 key that answers registration (attestation "none")
 * and authentication options the way an authenticator does (W3C Web Authentication Level 2, §6.1 authenticator data,
 * §6.5.4 "none" attestation; RFC 8949 CBOR; RFC 9052 COSE_Key), with a signature counter the test sets. The browser
 * path (Chromium's virtual authenticator) is test/identities/passkeys.e2e-spec.ts; this one serves the counter and
 * API-contract tests.
 */
import { createHash, generateKeyPairSync, randomBytes, sign } from 'node:crypto';

type Cbor = number | string | Uint8Array | Map<number | string, Cbor> | Record<string, never>;

function head(major: number, n: number): Buffer {
  if (n < 24) return Buffer.from([(major << 5) | n]);
  if (n < 256) return Buffer.from([(major << 5) | 24, n]);
  if (n < 65536) return Buffer.from([(major << 5) | 25, n >> 8, n & 0xff]);
  const b = Buffer.alloc(5);
  b[0] = (major << 5) | 26;
  b.writeUInt32BE(n, 1);
  return b;
}

/** CBOR (RFC 8949 §3): unsigned and negative integers, byte and text strings, maps (enough for COSE and attestation). */
function cbor(v: Cbor): Buffer {
  if (typeof v === 'number') return v >= 0 ? head(0, v) : head(1, -1 - v);
  if (typeof v === 'string') return Buffer.concat([head(3, Buffer.byteLength(v)), Buffer.from(v, 'utf8')]);
  if (v instanceof Uint8Array) return Buffer.concat([head(2, v.length), Buffer.from(v)]);
  const entries = v instanceof Map ? [...v.entries()] : Object.entries(v);
  return Buffer.concat([head(5, entries.length), ...entries.flatMap(([k, x]) => [cbor(k), cbor(x)])]);
}

const sha256 = (...parts: Buffer[]) => parts.reduce((h, p) => h.update(p), createHash('sha256')).digest();
const b64u = (b: Buffer) => b.toString('base64url');

export interface SoftPasskey {
  credentialId: string;
  /** The next signature's counter */
  counter: number;
  /** The authenticator's answer to registration options (as navigator.credentials.create gives it, JSON) */
  register(options: { challenge: string; rp: { id?: string } }, origin: string): unknown;
  /** The assertion over authentication options (as navigator.credentials.get gives it, JSON) */
  assert(options: { challenge: string; rpId?: string }, origin: string): { id: string; rawId: string; type: 'public-key'; response: { clientDataJSON: string; authenticatorData: string; signature: string }; clientExtensionResults: Record<string, never> };
}

export function softPasskey(): SoftPasskey {
  const { privateKey, publicKey } = generateKeyPairSync('ec', { namedCurve: 'P-256' });
  const jwk = publicKey.export({ format: 'jwk' });
  const id = randomBytes(16);
  // COSE_Key (RFC 9052 §7, RFC 9053 §7.1.1): kty 2 (EC2), alg -7 (ES256), crv 1 (P-256), x, y
  const coseKey = cbor(new Map<number, Cbor>([[1, 2], [3, -7], [-1, 1], [-2, Buffer.from(jwk.x!, 'base64url')], [-3, Buffer.from(jwk.y!, 'base64url')]]));
  const counterBytes = (n: number) => {
    const b = Buffer.alloc(4);
    b.writeUInt32BE(n);
    return b;
  };
  const passkey: SoftPasskey = {
    credentialId: b64u(id),
    counter: 0,
    register(options, origin) {
      const clientData = Buffer.from(JSON.stringify({ type: 'webauthn.create', challenge: options.challenge, origin, crossOrigin: false }));
      const idLength = Buffer.alloc(2);
      idLength.writeUInt16BE(id.length);
      // flags: user present (0x01), user verified (0x04), attested credential data (0x40)
      const authData = Buffer.concat([sha256(Buffer.from(options.rp.id!)), Buffer.from([0x45]), counterBytes(passkey.counter), Buffer.alloc(16), idLength, id, coseKey]);
      const attestation = cbor(new Map<string, Cbor>([['fmt', 'none'], ['attStmt', new Map()], ['authData', authData]]));
      return {
        id: passkey.credentialId, rawId: passkey.credentialId, type: 'public-key',
        response: { clientDataJSON: b64u(clientData), attestationObject: b64u(attestation), transports: ['internal'] },
        clientExtensionResults: {},
      };
    },
    assert(options, origin) {
      const clientData = Buffer.from(JSON.stringify({ type: 'webauthn.get', challenge: options.challenge, origin, crossOrigin: false }));
      const authData = Buffer.concat([sha256(Buffer.from(options.rpId!)), Buffer.from([0x05]), counterBytes(passkey.counter)]);
      const signature = sign('sha256', Buffer.concat([authData, sha256(clientData)]), privateKey);
      return {
        id: passkey.credentialId, rawId: passkey.credentialId, type: 'public-key',
        response: { clientDataJSON: b64u(clientData), authenticatorData: b64u(authData), signature: b64u(signature) },
        clientExtensionResults: {},
      };
    },
  };
  return passkey;
}
