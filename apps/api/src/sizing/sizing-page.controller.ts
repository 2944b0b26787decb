/**
 * The screw-selection page of the design workbench (/design/sizing): a public HTML shell like every page (it holds
 * no data; its script, pages/assets/design-sizing.js, asks POST /api/v1/sizing with the token kept in
 * sessionStorage). Rendered from templates/pages/design-sizing.hbs with the pages' own layout and partials and
 * served with the pages' strict Content-Security-Policy.
 */
import { Controller, Get, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { Public } from '../identities/auth.guard';
import { ASSET_BASE, contentSecurityPolicy } from '../pages/page-renderer';
import { CAUTION_TEXT } from '../reports/report-model';
import { Templates } from '../infra/templates';

/** Compiles the page once, with the pages' partials (layout, caution, sign-in). */
export function renderSizingPage(templatesDir?: string): string {
  const template = Templates.of(templatesDir).template<Record<string, unknown>>('pages/design-sizing');
  return template({ page: 'design-sizing', title: 'Find a screw', script: `${ASSET_BASE}design-sizing.js`, caution: CAUTION_TEXT, styleNonce: null });
}

@Public()
@Controller('design/sizing')
export class SizingPageController {
  private readonly html = renderSizingPage();

  /** Requirements form, ranked screws with their governing checks, "open as a new calculation". */
  @Get()
  page(@Res({ passthrough: true }) reply: FastifyReply): string {
    reply
      .header('content-type', 'text/html; charset=utf-8')
      .header('content-security-policy', contentSecurityPolicy())
      .header('x-content-type-options', 'nosniff')
      .header('referrer-policy', 'no-referrer')
      .header('cache-control', 'no-store');
    return this.html;
  }
}
