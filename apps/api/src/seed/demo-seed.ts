/**
 * Seeds the invented demo scenario through the same services the API uses, when the database is empty.
 */
import type { INestApplicationContext } from '@nestjs/common';
import { CalculationsService } from '../calculations/calculations.service';
import { Database } from '../infra/database/database.service';
import { ProductsService } from '../products/products.service';
import { DEMO_PRODUCTS } from './demo-designs';

export interface SeedResult {
  seeded: boolean;
  products: { id: string; code: string }[];
}

export async function seedDemo(app: INestApplicationContext): Promise<SeedResult> {
  const db = app.get(Database);
  const [{ n }] = await db.query<{ n: string }>(`SELECT count(*) AS n FROM products`);
  if (Number(n) > 0) return { seeded: false, products: [] };
  const products = app.get(ProductsService);
  const calculations = app.get(CalculationsService);
  const created: SeedResult['products'] = [];
  for (const p of DEMO_PRODUCTS) {
    const product = await products.create(p.product, null);
    created.push({ id: product.id, code: product.code });
    for (const c of p.calculations) await calculations.open(product.id, c, null);
  }
  return { seeded: true, products: created };
}
