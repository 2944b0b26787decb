/**
 * Starts the service. With no DATABASE_URL it runs on the embedded PGlite database in LEADLINE_DATA_DIR
 * and seeds the demo scenario when that database is empty.
 */
import 'reflect-metadata';
import { createApp } from './app.factory';
import { seedDemo } from './seed/demo-seed';

async function main(): Promise<void> {
  const { app, config } = await createApp({ env: process.env });
  const embedded = !config.DATABASE_URL;
  const seed = (config.LEADLINE_DEMO_SEED ?? embedded) ? await seedDemo(app, { issueTokens: config.LEADLINE_DEMO_TOKENS }) : { seeded: false, products: [], tokens: [], accounts: [] };
  await app.listen({ port: config.PORT, host: config.HOST });
  // the port actually bound (PORT=0 asks the system for a free one)
  const bound = (app.getHttpServer().address() as { port: number } | null)?.port ?? config.PORT;
  const url = `http://${config.HOST}:${bound}`;
  const lines = [
    '',
    `Leadline is listening on ${url}  (${embedded ? `embedded database in ${config.LEADLINE_DATA_DIR}` : 'PostgreSQL'})`,
    seed.seeded ? `Demo data seeded: ${seed.products.map((p) => p.code).join(', ')}` : 'Existing data kept (no demo seed).',
    ...(seed.accounts.length
      ? [
          `Demo accounts (sign in at ${url}/sign-in; passwords shown once, only their hashes are stored):`,
          ...seed.accounts.map((a) => `  ${a.name.padEnd(28)} ${a.roles.join(',').padEnd(9)} ${a.email.padEnd(26)} ${a.password}`),
        ]
      : []),
    ...(seed.tokens.length
      ? [
          `Demo tokens for API clients (shown once; only their hashes are stored; valid until ${seed.tokens[0].expiresAt}; they read and submit, and do not decide: a decision is signed in the pages):`,
          ...seed.tokens.map((t) => `  ${t.name.padEnd(28)} ${t.roles.join(',').padEnd(9)} ${t.token}`),
        ]
      : []),
    `  Design pages:  ${url}/design   (sign in as the design author)`,
    `  Review pages:  ${url}/review   (sign in as the checking engineer)`,
    `  API docs:      ${url}/api/docs`,
    ...(seed.tokens.length ? [`  export LEADLINE_TOKEN=${seed.tokens[0].token}    # the demo author`] : []),
    `  Products:      curl -H "Authorization: Bearer $LEADLINE_TOKEN" ${url}/api/v1/products`,
    `  Evaluate:      curl -X POST ${url}/api/v1/evaluations -H "Authorization: Bearer $LEADLINE_TOKEN" -H 'content-type: application/json' -d @test/fixtures/ok/trapezoidal-jack.json`,
    `  Review queue:  curl -H "Authorization: Bearer $LEADLINE_TOKEN" ${url}/api/v1/reviews/queue`,
    '',
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

main().catch((err) => {
  process.stderr.write(`leadline failed to start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
