import { Controller, Get, Param, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { randomBytes } from 'node:crypto';
import { Public } from '../identities/auth.guard';
import { notFound } from '../infra/http/problem';
import { checkUuid } from '../products/products.service';
import { contentSecurityPolicy, PageRenderer, type PageName } from './page-renderer';

/**
 * HTML shells of the reviewer pages. Public because they hold no data: each page's script asks the JSON API,
 * with the bearer token the user pasted (kept in sessionStorage), for everything it shows.
 */
@Public()
@Controller('review')
export class PagesController {
  constructor(private readonly pages: PageRenderer) {}

  /** Sign-in, then the revisions awaiting review. */
  @Get()
  queue(@Res({ passthrough: true }) reply: FastifyReply) {
    return this.html(reply, 'queue');
  }

  /** One revision: header, report, findings, decision form. */
  @Get('revisions/:id')
  revision(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'revision');
    return this.html(reply, 'revision', randomBytes(16).toString('hex'));
  }

  /** A product's audit trail and hash-chain check. */
  @Get('products/:id/audit')
  audit(@Param('id') id: string, @Res({ passthrough: true }) reply: FastifyReply) {
    checkUuid(id, 'product');
    return this.html(reply, 'audit');
  }

  /** The pages' script modules and stylesheets (pages/assets), for /review and /design alike. */
  @Get('assets/:name')
  asset(@Param('name') name: string, @Res({ passthrough: true }) reply: FastifyReply) {
    const asset = this.pages.asset(name);
    if (!asset) throw notFound(`asset ${name}`);
    reply.header('content-type', asset.contentType).header('cache-control', 'no-cache').header('x-content-type-options', 'nosniff');
    return asset.body;
  }

  private html(reply: FastifyReply, page: PageName, styleNonce?: string): string {
    return sendPage(reply, this.pages.render(page, styleNonce), styleNonce);
  }
}

/** A page shell with the pages' headers: strict CSP, no sniffing, no referrer, never cached. */
export function sendPage(reply: FastifyReply, html: string, styleNonce?: string): string {
  reply
    .header('content-type', 'text/html; charset=utf-8')
    .header('content-security-policy', contentSecurityPolicy(styleNonce))
    .header('x-content-type-options', 'nosniff')
    .header('referrer-policy', 'no-referrer')
    .header('cache-control', 'no-store');
  return html;
}
