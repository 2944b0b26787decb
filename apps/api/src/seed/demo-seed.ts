/**
 * Seeds the invented demo scenario through the same services the API uses, when the database is empty:
 * demo users named by role, two products of a fictional company, their screw calculations and a first review.
 * On every start of a demo database the demo users get fresh tokens (only hashes are stored), printed once.
 */
import type { INestApplicationContext } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { CalculationsService } from '../calculations/calculations.service';
import { IdentitiesService, type Role } from '../identities/identities.service';
import { Database } from '../infra/database/database.service';
import { ProductsService } from '../products/products.service';
import { ReviewsService } from '../reviews/reviews.service';
import { DEMO_PRODUCTS } from './demo-designs';

export const DEMO_USERS: { name: string; roles: Role[] }[] = [
  { name: 'Design author (demo)', roles: ['author'] },
  { name: 'Checking engineer (demo)', roles: ['reviewer'] },
  { name: 'Administrator (demo)', roles: ['admin'] },
];

export interface SeedResult {
  seeded: boolean;
  products: { id: string; code: string }[];
  tokens: { name: string; roles: Role[]; token: string }[];
}

export async function seedDemo(app: INestApplicationContext): Promise<SeedResult> {
  const db = app.get(Database);
  const identities = app.get(IdentitiesService);
  const [{ n }] = await db.query<{ n: string }>(`SELECT count(*) AS n FROM products`);
  const existing = await db.query<{ id: string; name: string; roles: Role[] }>(
    `SELECT id, name, roles FROM users WHERE name = ANY ($1) ORDER BY created_at`,
    [DEMO_USERS.map((u) => u.name)],
  );
  if (Number(n) > 0 && existing.length === 0) return { seeded: false, products: [], tokens: [] };

  const users = new Map<string, { id: string; name: string; roles: Role[] }>();
  for (const u of DEMO_USERS) users.set(u.name, existing.find((e) => e.name === u.name) ?? (await identities.createUser(u, null)));
  const tokens = [];
  for (const u of users.values()) tokens.push({ name: u.name, roles: u.roles, token: (await identities.issueToken(u.id, { label: 'demo start' }, null)).token });
  if (Number(n) > 0) return { seeded: false, products: [], tokens };

  const author: Actor = { id: users.get('Design author (demo)')!.id, name: 'Design author (demo)' };
  const reviewer: Actor = { id: users.get('Checking engineer (demo)')!.id, name: 'Checking engineer (demo)' };
  const products = app.get(ProductsService);
  const calculations = app.get(CalculationsService);
  const reviews = app.get(ReviewsService);
  const created: SeedResult['products'] = [];
  for (const p of DEMO_PRODUCTS) {
    const product = await products.create(p.product, author);
    created.push({ id: product.id, code: product.code });
    for (const c of p.calculations) {
      const opened = (await calculations.open(product.id, { title: c.title, design: c.design }, author)).body as { revisionId: string; verdict: string };
      if (c.review === 'approve') {
        const rev = await calculations.revision(opened.revisionId);
        const acknowledgements = rev.findings
          .filter((f) => f.severity === 'warning')
          .map((f) => ({ finding: f.ruleId, comment: 'Checked against the supplier data sheet (demo).' }));
        await reviews.decide(opened.revisionId, { decision: 'approve', comment: 'Checked; margins acceptable (demo).', acknowledgements }, reviewer);
      } else if (c.review === 'reject') {
        await reviews.decide(
          opened.revisionId,
          {
            decision: 'reject',
            comment: 'Not self-locking on lifting duty without a brake (demo).',
            comments: [{ text: 'Add a spring-applied brake or use a single-start thread (demo).', target: { field: 'duty.brake' } }],
          },
          reviewer,
        );
      }
    }
  }
  return { seeded: true, products: created, tokens };
}
