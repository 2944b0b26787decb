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
  const seed = (config.LEADLINE_DEMO_SEED ?? embedded) ? await seedDemo(app) : { seeded: false, products: [] };
  await app.listen({ port: config.PORT, host: config.HOST });
  const url = `http://${config.HOST}:${config.PORT}`;
  const lines = [
    '',
    `Leadline is listening on ${url}  (${embedded ? `embedded database in ${config.LEADLINE_DATA_DIR}` : 'PostgreSQL'})`,
    seed.seeded ? `Demo data seeded: ${seed.products.map((p) => p.code).join(', ')}` : 'Existing data kept (no demo seed).',
    `  API docs:      ${url}/api/docs`,
    `  Products:      curl ${url}/api/v1/products`,
    `  Evaluate:      curl -X POST ${url}/api/v1/evaluations -H 'content-type: application/json' -d @test/fixtures/ok/trapezoidal-jack.json`,
    '',
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

main().catch((err) => {
  process.stderr.write(`leadline failed to start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
