/**
 * Passkeys (W3C Web Authentication Level 2; @simplewebauthn/server): a signed-in user registers their own passkey,
 * then signs in with it or signs a decision with it. Every challenge is made by the service, stored with its expiry
 * (passkey_challenges) and used at most once (passkey_challenge_uses, through leadline_use_passkey_challenge, which
 * also checks that the signature counter advances). A decision's challenge is SHA-256(revision hash || nonce): the
 * assertion is a signature over that record only, and verify re-checks it with the registered key
 * (records/passkey-signature.ts).
 *
 * The relying party is the host of LEADLINE_PUBLIC_URL, or else of the request. Without LEADLINE_PUBLIC_URL the
 * expected origin is any origin on exactly that host (https, or http on localhost, the only plain-http origin a
 * browser offers WebAuthn on): the browser itself refuses an assertion for this RP ID to any other site.
 */
import { Inject, Injectable } from '@nestjs/common';
import { generateAuthenticationOptions, generateRegistrationOptions, verifyAuthenticationResponse, verifyRegistrationResponse } from '@simplewebauthn/server';
import type { AuthenticationResponseJSON, RegistrationResponseJSON } from '@simplewebauthn/server';
import { randomBytes, randomUUID } from 'node:crypto';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { Database, PG_UNIQUE_VIOLATION, pgErrorCode } from '../infra/database/database.service';
import { ProblemError, validate } from '../infra/http/problem';
import { functionRefusal } from '../records/record-store';
import { lockLedger, nextLink } from '../records/ledger';
import { signingChallenge, type StoredAssertion } from '../records/passkey-signature';
import { ServiceKeys } from '../records/service-keys';
import { TS_TEXT } from '../records/chain';
import { AccountsService, type SignedIn } from './accounts.service';
import { FailureLimiter } from './failure-limiter';
import { CURRENT_ROLES, USER_ACTIVE, type Principal, type Role } from './identities.service';

/** How long a passkey challenge is accepted [ms] (WebAuthn Level 2 §15.1 recommends 300 s to 600 s with user verification). */
export const PASSKEY_CHALLENGE_MS = 5 * 60_000;

/** Sign-in challenges per client address and minute (common practice: well above a person's retries). */
export const SIGN_IN_OPTIONS_PER_MINUTE = 30;

/** COSE algorithms offered (RFC 9053): ES256 and RS256, which every platform authenticator supports. */
const ALGORITHMS = [-7, -257];

const b64url = z.string().min(1).max(16_384).regex(/^[A-Za-z0-9_-]+$/, 'base64url');

export const authenticationResponseSchema = z.object({
  id: b64url.max(1400),
  rawId: b64url.max(1400),
  type: z.literal('public-key'),
  response: z.object({
    clientDataJSON: b64url,
    authenticatorData: b64url,
    signature: b64url,
    userHandle: b64url.max(100).optional(),
  }),
  clientExtensionResults: z.record(z.string(), z.unknown()).default({}),
  authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
});

const registrationResponseSchema = z.object({
  id: b64url.max(1400),
  rawId: b64url.max(1400),
  type: z.literal('public-key'),
  response: z.object({
    clientDataJSON: b64url,
    attestationObject: b64url,
    transports: z.array(z.string().max(20)).max(10).optional(),
  }),
  clientExtensionResults: z.record(z.string(), z.unknown()).default({}),
  authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
});

export const registerPasskeySchema = z.strictObject({
  challengeId: z.uuid(),
  response: registrationResponseSchema,
  label: z.string().trim().min(1).max(100).optional().describe('a name for this passkey (default: "Passkey")'),
});

export const passkeySignInSchema = z.strictObject({ challengeId: z.uuid(), response: authenticationResponseSchema });

/** The relying party of a request: its id (a host name) and the origin an assertion may come from. */
export interface RelyingParty {
  rpId: string;
  /** The one expected origin (LEADLINE_PUBLIC_URL), or null: any origin on the host rpId */
  origin: string | null;
}

interface ChallengeRow {
  id: string;
  user_id: string | null;
  purpose: 'register' | 'sign-in' | 'sign';
  challenge: string;
  revision_id: string | null;
  nonce: string | null;
  rp_id: string;
  expires_at: Date;
  used: boolean;
}

interface KeyRow {
  id: string;
  user_id: string;
  credential_id: string;
  public_key: string;
  rp_id: string;
  counter: string;
}

@Injectable()
export class PasskeysService {
  /** Sign-in challenges need no sign-in and each stores a row: counted per client address, shared by every instance. */
  readonly optionsLimiter: FailureLimiter;

  constructor(
    private readonly db: Database,
    private readonly accounts: AccountsService,
    private readonly keys: ServiceKeys,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {
    this.optionsLimiter = new FailureLimiter(db, 'passkey-options', SIGN_IN_OPTIONS_PER_MINUTE, 60_000);
  }

  /** The relying party for a request's host (`hostname`, without the port). */
  relyingParty(hostname: string): RelyingParty {
    if (this.config.LEADLINE_PUBLIC_URL) {
      const url = new URL(this.config.LEADLINE_PUBLIC_URL);
      return { rpId: url.hostname, origin: url.origin };
    }
    return { rpId: hostname, origin: null };
  }

  /** The origin the browser wrote into the client data, if this relying party accepts it. */
  private acceptedOrigin(clientDataJSON: string, rp: RelyingParty): string | null {
    let origin: unknown;
    try {
      origin = JSON.parse(Buffer.from(clientDataJSON, 'base64url').toString('utf8')).origin;
    } catch {
      return null;
    }
    if (typeof origin !== 'string') return null;
    if (rp.origin) return origin === rp.origin ? origin : null;
    try {
      const url = new URL(origin);
      const secure = url.protocol === 'https:' || (url.protocol === 'http:' && url.hostname === 'localhost');
      return secure && url.hostname === rp.rpId && url.origin === origin ? origin : null;
    } catch {
      return null;
    }
  }

  private async issueChallenge(credential: string, purpose: ChallengeRow['purpose'], challenge: string, rp: RelyingParty, revision: { id: string; nonce: string } | null) {
    const id = randomUUID();
    await this.db
      .query(`SELECT leadline_issue_passkey_challenge($1, $2, $3, $4, $5, $6, $7, $8)`, [
        credential, id, purpose, challenge, revision?.id ?? null, revision?.nonce ?? null, rp.rpId, new Date(this.clock.now() + PASSKEY_CHALLENGE_MS).toISOString(),
      ])
      .catch((err) => {
        throw functionRefusal(err) ?? err;
      });
    return id;
  }

  private async challengeRow(id: string): Promise<ChallengeRow | null> {
    const [row] = await this.db.query<ChallengeRow>(
      `SELECT c.id, c.user_id, c.purpose, c.challenge, c.revision_id, c.nonce, c.rp_id, c.expires_at,
              EXISTS (SELECT 1 FROM passkey_challenge_uses u WHERE u.challenge_id = c.id) AS used
         FROM passkey_challenges c WHERE c.id = $1`,
      [id],
    );
    return row ?? null;
  }

  /** A passkey by its credential id, with its current counter (the highest used, or the registered one). */
  private async keyOf(credentialId: string): Promise<KeyRow | null> {
    const [row] = await this.db.query<KeyRow>(
      `SELECT k.id, k.user_id, k.credential_id, k.public_key, k.rp_id,
              greatest(k.counter, coalesce((SELECT max(u.counter) FROM passkey_challenge_uses u WHERE u.credential_id = k.credential_id), 0))::text AS counter
         FROM passkey_credentials k WHERE k.credential_id = $1`,
      [credentialId],
    );
    return row ?? null;
  }

  /** The caller's own passkeys. */
  async list(userId: string) {
    return this.db.query(
      `SELECT id, label, credential_id AS "credentialId", rp_id AS "rpId", ${TS_TEXT('created_at')} AS "createdAt"
         FROM passkey_credentials WHERE user_id = $1 ORDER BY created_at, id`,
      [userId],
    );
  }

  /** Registration options for the signed-in user (their own page session only). */
  async registrationOptions(p: Principal, email: string | null, rp: RelyingParty) {
    if (!p.sessionId) throw new ProblemError(403, 'Sign in first', 'a passkey is added from your own signed-in page session, never with a token');
    const existing = await this.db.query<{ credential_id: string }>(`SELECT credential_id FROM passkey_credentials WHERE user_id = $1`, [p.id]);
    const options = await generateRegistrationOptions({
      rpName: 'Leadline',
      rpID: rp.rpId,
      userName: email ?? p.name,
      userDisplayName: p.name,
      userID: Buffer.from(p.id.replace(/-/g, ''), 'hex'),
      attestationType: 'none',
      excludeCredentials: existing.map((k) => ({ id: k.credential_id })),
      authenticatorSelection: { residentKey: 'required', userVerification: 'required' },
      supportedAlgorithmIDs: ALGORITHMS,
      timeout: PASSKEY_CHALLENGE_MS,
    });
    const challengeId = await this.issueChallenge(p.credential, 'register', options.challenge, rp, null);
    return { challengeId, options };
  }

  /** Stores the signed-in user's new passkey after checking the authenticator's answer to their challenge. */
  async register(p: Principal, body: unknown, rp: RelyingParty) {
    if (!p.sessionId) throw new ProblemError(403, 'Sign in first', 'a passkey is added from your own signed-in page session, never with a token');
    const input = validate(registerPasskeySchema, body);
    const refuse = (detail: string): never => {
      throw new ProblemError(403, 'Passkey not accepted', detail, { errors: [{ path: 'response', message: detail }] });
    };
    const challenge = await this.challengeRow(input.challengeId);
    if (!challenge || challenge.purpose !== 'register' || challenge.user_id !== p.id) refuse('not your registration challenge: ask for new options');
    if (challenge!.used || this.clock.now() >= new Date(challenge!.expires_at).getTime()) refuse('the registration challenge was used already or has expired');
    const origin = this.acceptedOrigin(input.response.response.clientDataJSON, { ...rp, rpId: challenge!.rp_id });
    if (!origin) refuse('the passkey was made on another site');
    let verified: Awaited<ReturnType<typeof verifyRegistrationResponse>>;
    try {
      verified = await verifyRegistrationResponse({
        response: input.response as RegistrationResponseJSON,
        expectedChallenge: challenge!.challenge,
        expectedOrigin: origin!,
        expectedRPID: challenge!.rp_id,
        requireUserVerification: true,
        supportedAlgorithmIDs: ALGORITHMS,
      });
    } catch (err) {
      return refuse(`the authenticator's answer does not verify: ${(err as Error).message}`);
    }
    if (!verified.verified || !verified.registrationInfo) refuse('the authenticator\'s answer does not verify');
    const info = verified.registrationInfo!;
    const id = randomUUID();
    const credentialId = info.credential.id;
    const publicKey = Buffer.from(info.credential.publicKey).toString('base64url');
    const label = input.label ?? 'Passkey';
    try {
      await this.db.transaction(async (q) => {
        const event = nextLink(this.keys.key, await lockLedger(q, 'identity'), {
          kind: 'identity-event', id: randomUUID(), type: 'passkey-registered', actorId: p.id, actorTokenId: null, subjectUserId: p.id, tokenId: null,
          data: { passkeyId: id, credentialId, publicKey, rpId: challenge!.rp_id, label },
        });
        await q.query(`SELECT leadline_register_passkey($1, $2, $3, $4, $5, $6, $7, $8)`, [
          p.credential, challenge!.id, id, credentialId, publicKey, info.credential.counter, label, JSON.stringify([event]),
        ]);
      });
    } catch (err) {
      if (pgErrorCode(err) === PG_UNIQUE_VIOLATION) refuse('this registration challenge was used a moment ago, or the passkey is registered already');
      throw functionRefusal(err) ?? err;
    }
    return { id, label, credentialId, rpId: challenge!.rp_id };
  }

  /** Options for signing in with a passkey (discoverable: the authenticator offers the user's passkeys). */
  async signInOptions(rp: RelyingParty, client: string) {
    const wait = await this.optionsLimiter.blocked(client, this.clock.now());
    if (wait > 0) throw new ProblemError(429, 'Too many sign-in challenges', `too many passkey sign-in challenges from this address; try again in ${wait} s`, { retryAfter: wait });
    await this.optionsLimiter.fail(client, this.clock.now());
    const options = await generateAuthenticationOptions({ rpID: rp.rpId, userVerification: 'required', timeout: PASSKEY_CHALLENGE_MS });
    const challengeId = await this.issueChallenge(await this.keys.serviceCredential(), 'sign-in', options.challenge, rp, null);
    return { challengeId, options };
  }

  /** Signs in with a passkey: a page session (method passkey) for the passkey's user. */
  async signIn(body: unknown, client: string, rp: RelyingParty): Promise<SignedIn> {
    const limiter = this.accounts.limiter;
    const wait = await limiter.blocked(client, this.clock.now());
    if (wait > 0) throw new ProblemError(429, 'Too many failed attempts', `too many failed attempts from this address; try again in ${wait} s`, { retryAfter: wait });
    const input = validate(passkeySignInSchema, body);
    // A refusal counts as a failed attempt (shared by every instance) before it is answered
    try {
      return await this.passkeySignIn(input, rp);
    } catch (err) {
      if (err instanceof ProblemError && err.status === 401) await limiter.fail(client, this.clock.now());
      throw err;
    }
  }

  private async passkeySignIn(input: z.infer<typeof passkeySignInSchema>, rp: RelyingParty): Promise<SignedIn> {
    const refuse = (detail: string): never => {
      throw new ProblemError(401, 'Sign-in refused', detail, { errors: [{ path: 'response', message: detail }] });
    };
    const challenge = await this.challengeRow(input.challengeId);
    if (!challenge || challenge.purpose !== 'sign-in') return refuse('not a sign-in challenge of this service: ask for new options');
    const key = await this.checkAssertion(input.response as AuthenticationResponseJSON, challenge, rp, refuse);
    const fresh = await this.use(await this.keys.serviceCredential(), challenge, key, refuse);
    if (!fresh) refuse('this sign-in challenge was used already');
    const [user] = await this.db.query<{ id: string; name: string; email: string | null; roles: Role[] }>(
      `SELECT u.id, u.name, u.email, ${CURRENT_ROLES('u')} AS roles FROM users u WHERE u.id = $1 AND ${USER_ACTIVE('u')}`,
      [key.user_id],
    );
    if (!user) return refuse('the account is not active');
    return this.accounts.startSession(user, 'passkey', this.clock.now());
  }

  /**
   * A challenge for signing a revision with a passkey: SHA-256(revision hash || nonce), offered to the signer's own
   * passkeys.
   */
  async signingOptions(p: Principal, revisionId: string, revisionHash: string, rp: RelyingParty) {
    const keys = await this.db.query<{ credential_id: string }>(`SELECT credential_id FROM passkey_credentials WHERE user_id = $1 AND rp_id = $2`, [p.id, rp.rpId]);
    if (keys.length === 0) {
      throw new ProblemError(409, 'No passkey', 'you have no passkey for this site: add one on your account page first', { errors: [{ path: 'signature', message: 'no passkey registered' }] });
    }
    const nonce = randomBytes(32).toString('base64url');
    const challenge = signingChallenge(revisionHash, nonce);
    const options = await generateAuthenticationOptions({
      rpID: rp.rpId, challenge: Buffer.from(challenge, 'base64url'), userVerification: 'required', timeout: PASSKEY_CHALLENGE_MS,
      allowCredentials: keys.map((k) => ({ id: k.credential_id })),
    });
    const challengeId = await this.issueChallenge(p.credential, 'sign', challenge, rp, { id: revisionId, nonce });
    return { challengeId, revisionHash, options };
  }

  /**
   * Checks a passkey signature on a revision by `p` and uses its challenge; answers the assertion to store with the
   * decision, or refuses through `refuse`.
   */
  async sign(
    sig: { challengeId: string; response: z.infer<typeof authenticationResponseSchema> },
    p: Principal,
    revision: { id: string; hash: string },
    rp: RelyingParty,
    refuse: (path: string, detail: string) => never,
  ): Promise<StoredAssertion> {
    const path = 'signature.response';
    const challenge = await this.challengeRow(sig.challengeId);
    if (!challenge || challenge.purpose !== 'sign' || challenge.user_id !== p.id) return refuse('signature.challengeId', 'not a signing challenge of yours: ask for one (POST /api/v1/revisions/:id/passkey-challenges)');
    if (challenge.revision_id !== revision.id || challenge.challenge !== signingChallenge(revision.hash, challenge.nonce!)) {
      return refuse('signature.challengeId', 'this challenge was made for signing another revision');
    }
    const response = sig.response as AuthenticationResponseJSON;
    const key = await this.checkAssertion(response, challenge, rp, (detail) => refuse(path, detail));
    if (key.user_id !== p.id) return refuse(path, 'not your passkey');
    const fresh = await this.use(p.credential, challenge, key, (detail) => refuse(path, detail));
    if (!fresh) return refuse(path, 'this signing challenge has signed already');
    return {
      credentialId: key.credential_id, nonce: challenge.nonce!,
      authenticatorData: response.response.authenticatorData, clientDataJSON: response.response.clientDataJSON, signature: response.response.signature,
    };
  }

  /** Verifies an assertion against its stored challenge and the registered key; answers the key. */
  private async checkAssertion(response: AuthenticationResponseJSON, challenge: ChallengeRow, rp: RelyingParty, refuse: (detail: string) => never): Promise<KeyRow & { newCounter: number }> {
    if (challenge.used) return refuse('this challenge was used already');
    if (this.clock.now() >= new Date(challenge.expires_at).getTime()) return refuse('the challenge has expired: ask for a new one');
    const key = await this.keyOf(response.id);
    if (!key || key.rp_id !== challenge.rp_id) return refuse('this passkey is not registered here');
    const origin = this.acceptedOrigin(response.response.clientDataJSON, { ...rp, rpId: challenge.rp_id });
    if (!origin) return refuse('the passkey signature was made on another site');
    let verified: Awaited<ReturnType<typeof verifyAuthenticationResponse>>;
    try {
      verified = await verifyAuthenticationResponse({
        response,
        expectedChallenge: challenge.challenge,
        expectedOrigin: origin,
        expectedRPID: challenge.rp_id,
        credential: { id: key.credential_id, publicKey: Buffer.from(key.public_key, 'base64url'), counter: Number(key.counter) },
        requireUserVerification: true,
      });
    } catch (err) {
      return refuse(`the passkey signature does not verify: ${(err as Error).message}`);
    }
    if (!verified.verified) return refuse('the passkey signature does not verify');
    return { ...key, newCounter: verified.authenticationInfo.newCounter };
  }

  /** Uses the challenge once with the assertion's counter (false: used a moment ago). */
  private async use(credential: string, challenge: ChallengeRow, key: KeyRow & { newCounter: number }, refuse: (detail: string) => never): Promise<boolean> {
    try {
      const [row] = await this.db.query<{ fresh: boolean }>(`SELECT leadline_use_passkey_challenge($1, $2, $3, $4) AS fresh`, [credential, challenge.id, key.credential_id, key.newCounter]);
      return Boolean(row?.fresh);
    } catch (err) {
      const refusal = functionRefusal(err);
      if (refusal && refusal.status === 403) return refuse(refusal.message);
      throw err;
    }
  }
}
