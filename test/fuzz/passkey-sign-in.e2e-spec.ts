/**
 * HTTP fuzz of passkey sign-in (test/fuzz/fuzz-support.ts): 300 inputs in the default run. Each input answers a fresh
 * sign-in challenge of the service with a mutated assertion of the shape W3C Web Authentication Level 2 defines
 * (clientDataJSON, authenticatorData, signature as base64url), signed by no registered passkey: every input must be
 * refused with a problem naming the field, write no row, and never answer 5xx. The failure limit per address (10 a
 * minute, tested in test/identities/passkeys.e2e-spec.ts) is stepped past with the service's clock.
 */
import { createHash, randomBytes } from 'node:crypto';
import fc from 'fast-check';
import { TestClock } from '../support/clock';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget, type Json } from './fuzz-support';

const clock = new TestClock();
let target: FuzzTarget;
beforeAll(async () => (target = await startFuzzTarget('FZ-P', {}, { clock })));
afterAll(() => target?.close());

const b64url = (bytes: Buffer): string => bytes.toString('base64url');

/** An assertion of the right shape for a challenge: client data naming it, authenticator data for the RP id (flags UP|UV), a signature of no key. */
function assertion(challenge: string, rpId: string): Json {
  const credentialId = b64url(randomBytes(32));
  const clientData = { type: 'webauthn.get', challenge, origin: `http://${rpId}`, crossOrigin: false };
  const authenticatorData = Buffer.concat([createHash('sha256').update(rpId).digest(), Buffer.from([0x05]), Buffer.from([0, 0, 0, 7])]);
  return {
    id: credentialId,
    rawId: credentialId,
    type: 'public-key',
    response: { clientDataJSON: b64url(Buffer.from(JSON.stringify(clientData))), authenticatorData: b64url(authenticatorData), signature: b64url(randomBytes(72)) },
    clientExtensionResults: {},
  };
}

it(`passkey sign-in: no 5xx, every refusal names a field, no row written [POST /api/v1/sessions/passkey] (seed ${SEED})`, async () => {
  await fuzz(
    target,
    fc.asyncProperty(mutations, async (ops) => {
      clock.advance(61_000); // past the per-address limits of the minute before
      const options = await target.t.call('POST', '/api/v1/sessions/passkey/options', {});
      expect(options.status).toBe(201);
      target.forget(); // the challenge is a row of its own
      const body = { challengeId: options.body.challengeId, response: assertion(options.body.options.challenge, options.body.options.rpId) };
      const res = await target.check('POST', '/api/v1/sessions/passkey', mutate(body, ops));
      expect(res.status).toBeGreaterThanOrEqual(400); // no registered passkey signed it: never a session
    }) as never,
    300,
  );
}, FUZZ_TIMEOUT_MS);
