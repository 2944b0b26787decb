import { Body, Controller, Get, Param, Post, Query } from '@nestjs/common';
import { UserLimit } from '../infra/http/user-limits';
import type { Actor } from '@leadline/contracts';
import { Roles } from '../identities/auth.guard';
import { CurrentActor } from '../infra/http/actor';
import { validate } from '../infra/http/problem';
import { RecordStore } from '../records/record-store';
import { CalculationsService } from '../calculations/calculations.service';
import { checkUuid, productListSchema, ProductsService } from './products.service';

@Controller('api/v1/products')
export class ProductsController {
  constructor(
    private readonly products: ProductsService,
    private readonly calculations: CalculationsService,
    private readonly records: RecordStore,
  ) {}

  @Post()
  @UserLimit('submissions')
  @Roles('author', 'admin')
  create(@Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.products.create(body, actor);
  }

  @Get()
  list(@Query() query: unknown) {
    const page = validate(productListSchema, query);
    return this.products.list(page.limit, page.offset, page.q || undefined, page.state);
  }

  @Get(':id')
  async get(@Param('id') id: string) {
    const product = await this.products.get(id);
    return { ...product, calculations: await this.calculations.listForProduct(id) };
  }

  /** Recomputes the product's hash chain and names the first broken link. */
  @Get(':id/verify')
  async verify(@Param('id') id: string) {
    checkUuid(id, 'product');
    return this.records.verify(id);
  }
}
