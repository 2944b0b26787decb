/**
 * Sign-in at the company's identity provider: OpenID Connect authorization code flow with PKCE (RFC 7636) and
 * discovery (OpenID Connect Discovery 1.0), through openid-client. A login started here is kept for LOGIN_TTL_MS
 * under its random `state` (this process's memory: a multi-instance deployment needs sticky sessions for the few
 * seconds of a login); the browser holds the same state in a short-lived cookie, so a callback that this browser did
 * not start is refused (login CSRF, RFC 6749 §10.12). A login for signing asks for max_age=0 (OpenID Connect Core 1.0
 * §3.1.2.1), so the provider authenticates the person again, and its auth_time must not be older than the start.
 */
import { Inject, Injectable } from '@nestjs/common';
import type * as OidcClient from 'openid-client';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { CLOCK, type Clock } from '../infra/clock';
import { ProblemError } from '../infra/http/problem';
import { ROLES, type Role } from './identities.service';

/** How long a started login may take to come back [ms] (common practice: minutes). */
export const LOGIN_TTL_MS = 10 * 60_000;
export const OIDC_STATE_COOKIE = 'leadline_oidc';
const MAX_PENDING = 10_000;

// openid-client is ESM only: an import() that tsc leaves alone (as for vega in reports/charts.ts)
const nativeImport = new Function('specifier', `return import(specifier); /* ${Math.random()} */`) as <T>(specifier: string) => Promise<T>;

export interface PendingLogin {
  verifier: string;
  nonce: string;
  purpose: 'login' | 'sign';
  next: string;
  revisionId: string | null;
  /** Service clock when the login (for signing: the signature) started [ms] */
  startedAt: number;
  redirectUri: string;
}

export interface ProviderIdentity {
  email: string;
  name: string;
  roles: Role[];
  /** When the provider authenticated the person [ms] */
  authTime: number;
}

@Injectable()
export class OidcService {
  private readonly pending = new Map<string, PendingLogin>();
  private configuration: Promise<OidcClient.Configuration> | null = null;
  private lib: Promise<typeof OidcClient> | null = null;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  get enabled(): boolean {
    return Boolean(this.config.LEADLINE_OIDC_ISSUER && this.config.LEADLINE_OIDC_CLIENT_ID);
  }

  private client(): Promise<typeof OidcClient> {
    this.lib ??= nativeImport<typeof OidcClient>('openid-client');
    return this.lib;
  }

  /** The provider's configuration by discovery, fetched once (again after a failure). */
  private async discovered(): Promise<OidcClient.Configuration> {
    if (!this.enabled) throw new ProblemError(404, 'No identity provider', 'this site signs in with local accounts only (LEADLINE_OIDC_ISSUER is not set)');
    const client = await this.client();
    const issuer = new URL(this.config.LEADLINE_OIDC_ISSUER!);
    // plain http only to a provider on this machine (tests, a local provider); anywhere else openid-client refuses it
    const loopback = ['localhost', '127.0.0.1', '[::1]'].includes(issuer.hostname);
    this.configuration ??= client.discovery(issuer, this.config.LEADLINE_OIDC_CLIENT_ID!, this.config.LEADLINE_OIDC_CLIENT_SECRET, undefined,
      issuer.protocol === 'http:' && loopback ? { execute: [client.allowInsecureRequests] } : undefined);
    this.configuration.catch(() => (this.configuration = null));
    return this.configuration;
  }

  /** Starts a login: the provider's authorization address to send the browser to, and the state for its cookie. */
  async start(purpose: 'login' | 'sign', next: string, revisionId: string | null, redirectUri: string): Promise<{ url: string; state: string }> {
    const client = await this.client();
    const configuration = await this.discovered();
    const now = this.clock.now();
    for (const [k, p] of this.pending) if (now - p.startedAt > LOGIN_TTL_MS || this.pending.size >= MAX_PENDING) this.pending.delete(k);
    const verifier = client.randomPKCECodeVerifier();
    const state = client.randomState();
    const nonce = client.randomNonce();
    this.pending.set(state, { verifier, nonce, purpose, next, revisionId, startedAt: now, redirectUri });
    const params: Record<string, string> = {
      redirect_uri: redirectUri,
      scope: 'openid email profile',
      code_challenge: await client.calculatePKCECodeChallenge(verifier),
      code_challenge_method: 'S256',
      state,
      nonce,
    };
    if (purpose === 'sign') {
      params.max_age = '0';
      params.prompt = 'login';
    }
    return { url: client.buildAuthorizationUrl(configuration, params).href, state };
  }

  /**
   * Completes a login at the callback: the state must be one this service started and the browser's cookie must
   * hold it; the code is exchanged with the PKCE verifier; the ID token's nonce (and for signing, auth_time) checked.
   */
  async finish(callbackUrl: URL, cookieState: string | null): Promise<{ pending: PendingLogin; identity: ProviderIdentity }> {
    const client = await this.client();
    const configuration = await this.discovered();
    const state = callbackUrl.searchParams.get('state') ?? '';
    const pending = this.pending.get(state);
    if (!pending || !cookieState || cookieState !== state) throw new ProblemError(400, 'Login not recognised', 'this login was not started in this browser, or took too long; start again');
    this.pending.delete(state);
    if (this.clock.now() - pending.startedAt > LOGIN_TTL_MS) throw new ProblemError(400, 'Login too slow', 'the login took too long; start again');
    const tokens = await client.authorizationCodeGrant(configuration, callbackUrl, {
      pkceCodeVerifier: pending.verifier,
      expectedState: state,
      expectedNonce: pending.nonce,
      ...(pending.purpose === 'sign' ? { maxAge: 0 } : {}),
    }, { redirect_uri: pending.redirectUri });
    const claims = tokens.claims();
    if (!claims) throw new ProblemError(502, 'No ID token', 'the identity provider answered without an ID token');
    const email = typeof claims.email === 'string' ? claims.email.trim() : '';
    if (!email) throw new ProblemError(403, 'No email', 'the identity provider gave no email for this person; ask for the email scope to be released to this service');
    const authTime = typeof claims.auth_time === 'number' ? claims.auth_time * 1000 : null;
    if (authTime === null) throw new ProblemError(403, 'No auth_time', 'the identity provider did not say when the person authenticated');
    return { pending, identity: { email, name: typeof claims.name === 'string' && claims.name.trim() ? claims.name.trim() : email, roles: this.roles(claims), authTime } };
  }

  /** The roles named by LEADLINE_OIDC_ROLE_CLAIM (a list, or a space-separated string); unknown names are ignored. */
  private roles(claims: Record<string, unknown>): Role[] {
    const raw = claims[this.config.LEADLINE_OIDC_ROLE_CLAIM];
    const names = Array.isArray(raw) ? raw.map(String) : typeof raw === 'string' ? raw.split(/[\s,]+/) : [];
    return ROLES.filter((r) => names.includes(r));
  }
}
