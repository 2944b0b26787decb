/**
 * Seeds the invented demo scenario through the same services the API uses, only into an empty database (no
 * products): demo users named by role, two products of a fictional company, their screw calculations and a first
 * review. The demo accounts get generated passwords, printed once by the first seed. The demo users' tokens are short-lived (LEADLINE_DEMO_TOKEN_TTL_HOURS) and are issued and printed only
 * by that first seed, or on a later start when asked explicitly (LEADLINE_DEMO_TOKENS=true); only hashes are stored.
 */
import type { INestApplicationContext } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { randomBytes, randomUUID } from 'node:crypto';
import { CalculationsService } from '../calculations/calculations.service';
import { AccountsService } from '../identities/accounts.service';
import { IdentitiesService, type Role } from '../identities/identities.service';
import { APP_CONFIG, type AppConfig } from '../infra/config';
import { Database } from '../infra/database/database.service';
import { actingAs } from '../infra/http/actor';
import { ProductsService } from '../products/products.service';
import { prepareSubmission, RecordStore } from '../records/record-store';
import { ReviewsService } from '../reviews/reviews.service';
import { DEMO_PRODUCTS } from './demo-designs';
import type { RecordedAssessment } from './recorded-history';

/**
 * Opens a demo calculation whose first revision is a recorded historical assessment (engine and rule-set versions of
 * its time), through the same chain append as every submission. Demo seeding only; no route reaches it.
 */
async function openRecorded(app: INestApplicationContext, productId: string, title: string, design: unknown, recorded: RecordedAssessment, author: Actor) {
  if (JSON.stringify(recorded.input) !== JSON.stringify(design)) throw new Error(`recorded history of "${title}" is for another design`);
  const db = app.get(Database);
  const records = app.get(RecordStore);
  const prepared = prepareSubmission({
    input: recorded.input, normalized: recorded.normalized, evaluation: recorded.evaluation, findings: recorded.findings,
    verdict: recorded.verdict, engineVersion: recorded.engineVersion, ruleSetVersion: recorded.ruleSetVersion,
    // A note as an engineer writes one (the demo shows no internal wording)
    note: `Approved as judged then: engine ${recorded.engineVersion}, rule set ${recorded.ruleSetVersion}. Later rule sets check the threads more strictly.`,
  });
  return db.transaction(async (q) => {
    const cursor = await records.lockHead(q, productId);
    if (!cursor) throw new Error(`product ${productId} missing`);
    const calculationId = randomUUID();
    // the calculation-opened link writes the calculation row too (leadline_append_event)
    await records.appendEvent(q, cursor, { productId, type: 'calculation-opened', calculationId, revisionId: null, actor: author, data: { title } });
    const revision = await records.appendRevision(q, productId, calculationId, prepared, author, cursor);
    return { calculationId, revisionId: revision.id, verdict: recorded.verdict };
  });
}

/** Demo users, named by role; their emails are in the reserved example.com domain (RFC 2606). */
export const DEMO_USERS: { name: string; email: string; roles: Role[] }[] = [
  { name: 'Design author (demo)', email: 'author@demo.example.com', roles: ['author'] },
  { name: 'Checking engineer (demo)', email: 'checker@demo.example.com', roles: ['reviewer'] },
  { name: 'Administrator (demo)', email: 'admin@demo.example.com', roles: ['admin'] },
];

export interface SeedResult {
  seeded: boolean;
  products: { id: string; code: string }[];
  tokens: { name: string; roles: Role[]; token: string; expiresAt: string }[];
  /** The demo accounts' emails and passwords: set and printed by the first seed only (only hashes are stored) */
  accounts: { name: string; email: string; roles: Role[]; password: string }[];
}

export interface SeedOptions {
  /** Issue fresh demo tokens although the database is not empty (LEADLINE_DEMO_TOKENS) */
  readonly issueTokens?: boolean;
}

export async function seedDemo(app: INestApplicationContext, options: SeedOptions = {}): Promise<SeedResult> {
  const db = app.get(Database);
  const identities = app.get(IdentitiesService);
  const config = app.get<AppConfig>(APP_CONFIG);
  const ttlMs = config.LEADLINE_DEMO_TOKEN_TTL_HOURS * 3_600_000;
  const [{ n }] = await db.query<{ n: string }>(`SELECT count(*) AS n FROM products`);
  const existing = await db.query<{ id: string; name: string; roles: Role[] }>(
    `SELECT id, name, roles FROM users WHERE name = ANY ($1) ORDER BY created_at`,
    [DEMO_USERS.map((u) => u.name)],
  );
  const issue = async (users: Iterable<{ id: string; name: string; roles: Role[] }>) => {
    const tokens: SeedResult['tokens'] = [];
    for (const u of users) {
      const issued = await identities.issueToken(u.id, { label: 'demo start' }, null, { ttlMs });
      tokens.push({ name: u.name, roles: u.roles, token: issued.token, expiresAt: issued.expiresAt });
    }
    return tokens;
  };
  // Not empty: nothing is seeded, and tokens only when asked for, for demo users that exist
  if (Number(n) > 0) return { seeded: false, products: [], tokens: options.issueTokens && existing.length > 0 ? await issue(existing) : [], accounts: [] };

  // Each demo account is activated the way a user activates one (a one-time code, the user's own password)
  const accountsService = app.get(AccountsService);
  const users = new Map<string, { id: string; name: string; roles: Role[] }>();
  const accounts: SeedResult['accounts'] = [];
  for (const u of DEMO_USERS) {
    const found = existing.find((e) => e.name === u.name);
    if (found) {
      users.set(u.name, found);
      continue;
    }
    const created = await identities.createUser(u, null);
    const password = `demo-${randomBytes(15).toString('base64url')}`;
    await accountsService.activate({ activationCode: created.activationCode, password }, 'demo seed');
    users.set(u.name, created);
    accounts.push({ name: u.name, email: u.email, roles: u.roles, password });
  }
  const tokens = await issue(users.values());
  const checkerPassword = accounts.find((a) => a.name === 'Checking engineer (demo)')?.password;

  // the demo author acts with the token just issued to them, as through the API
  const actingWith = async (name: string): Promise<Actor> => {
    const principal = await identities.authenticate(tokens.find((t) => t.name === name)!.token);
    return actingAs({ id: users.get(name)!.id, name }, principal!);
  };
  const author = await actingWith('Design author (demo)');
  // The checking engineer signs in with their own password (a page session, their own credential) and signs the
  // demo's decisions with it, through the same check as every decision
  const checker = accounts.find((a) => a.name === 'Checking engineer (demo)');
  const signedIn = checker ? await accountsService.signIn({ email: checker.email, password: checker.password }, 'demo seed') : null;
  const session = signedIn ? await accountsService.resolveSession(signedIn.cookie) : null;
  const reviewerPrincipal = session?.principal ?? (await identities.authenticate(tokens.find((t) => t.name === 'Checking engineer (demo)')!.token))!;
  const reviewer = actingAs({ id: users.get('Checking engineer (demo)')!.id, name: 'Checking engineer (demo)' }, reviewerPrincipal);
  const signer = { principal: reviewerPrincipal, client: 'demo seed', hostname: 'localhost' };
  const signature = { method: 'password', password: checkerPassword };
  const products = app.get(ProductsService);
  const calculations = app.get(CalculationsService);
  const reviews = app.get(ReviewsService);
  const created: SeedResult['products'] = [];
  for (const p of DEMO_PRODUCTS) {
    const product = await products.create(p.product, author);
    created.push({ id: product.id, code: product.code });
    for (const c of p.calculations) {
      const opened =
        'recorded' in c && c.recorded
          ? await openRecorded(app, product.id, c.title, c.design, c.recorded, author)
          : ((await calculations.open(product.id, { title: c.title, design: c.design }, author)).body as { revisionId: string; verdict: string });
      if (c.review === 'approve') {
        const rev = await calculations.revision(opened.revisionId);
        const acknowledgements = rev.findings
          .filter((f) => f.severity === 'warning')
          .map((f) => ({ finding: f.ruleId, comment: 'Checked against the supplier data sheet (demo).' }));
        await reviews.decide(opened.revisionId, { decision: 'approve', comment: 'Checked; margins acceptable (demo).', acknowledgements, signature }, reviewer, signer.principal.roles, signer);
      } else if (c.review === 'reject') {
        await reviews.decide(
          opened.revisionId,
          {
            decision: 'reject',
            comment: 'Not self-locking on lifting duty without a brake (demo).',
            comments: [{ text: 'Add a spring-applied brake or use a single-start thread (demo).', target: { field: 'duty.brake' } }],
            signature,
          },
          reviewer,
          signer.principal.roles,
          signer,
        );
      }
    }
  }
  return { seeded: true, products: created, tokens, accounts };
}
