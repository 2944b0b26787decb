import { Controller, Get, Param, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { Public } from '../identities/auth.guard';
import { checkUuid } from '../products/products.service';
import { sendPage } from './pages.controller';
import { PageRenderer } from './page-renderer';

/**
 * HTML shells of the design workbench under /design (the author's pages). Public because they hold no data:
 * each page's module asks the JSON API, with the token kept in sessionStorage, for everything it shows.
 */
@Public()
@Controller('design')
export class DesignPagesController {
  constructor(private readonly pages: PageRenderer) {}

  /** Products: search and register. */
  @Get()
  products(@Res({ passthrough: true }) reply: FastifyReply) {
    return sendPage(reply, this.pages.render('design-products'));
  }

  /** The signed-in author's revisions by review state. */
  @Get('my-work')
  myWork(@Res({ passthrough: true }) reply: FastifyReply) {
    return sendPage(reply, this.pages.render('design-my-work'));
  }

  /** One product: its calculations, the design file. */
  @Get('products/:id')
  product(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'product');
    return sendPage(reply, this.pages.render('design-product'));
  }

  /** The design form for a new calculation of the product. */
  @Get('products/:id/new')
  newCalculation(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'product');
    return sendPage(reply, this.pages.render('design-form'));
  }

  /** One calculation: its revisions, side-by-side comparison. */
  @Get('calculations/:id')
  calculation(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'calculation');
    return sendPage(reply, this.pages.render('design-calculation'));
  }

  /** The design form for the next revision, prefilled from the latest (or ?from=<revision id>). */
  @Get('calculations/:id/revise')
  revise(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'calculation');
    return sendPage(reply, this.pages.render('design-form'));
  }
}
