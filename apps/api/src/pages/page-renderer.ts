/**
 * The reviewer pages: Handlebars shells compiled once, and the one script and stylesheet they load, read from
 * disk once. The shells carry no data; the script fetches everything from the JSON API with the user's token.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import Handlebars from 'handlebars';
import { CAUTION_TEXT } from '../reports/report-model';
import { findTemplatesDir } from '../reports/report-renderer';

export const PAGES = ['queue', 'revision', 'audit'] as const;
export type PageName = (typeof PAGES)[number];

const TITLES: Record<PageName, string> = { queue: 'Review queue', revision: 'Revision under review', audit: 'Audit trail' };

export interface Asset {
  readonly body: string;
  readonly contentType: string;
}

/**
 * The pages' Content-Security-Policy: nothing from outside, no inline script or style, no plugins, no form
 * submission (forms are handled by the script, so a token can never be submitted into a URL).
 * The revision page adds a per-response nonce to style-src: its report frame (srcdoc) inherits this policy,
 * and the script marks the report's own styles with the nonce so that they apply inside the frame.
 */
export function contentSecurityPolicy(styleNonce?: string): string {
  return [
    "default-src 'self'",
    "script-src 'self'",
    `style-src 'self'${styleNonce ? ` 'nonce-${styleNonce}'` : ''}`,
    "img-src 'self' data:",
    "font-src 'none'",
    "frame-src 'self' data: about:",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'none'",
    "frame-ancestors 'none'",
  ].join('; ');
}

/** Finds pages/assets beside this file (source) or in the repository above it (dist, where tsc copies no assets). */
export function findAssetsDir(start: string = __dirname): string {
  const beside = join(start, 'assets');
  if (existsSync(join(beside, 'review.js'))) return beside;
  for (let dir = start; dirname(dir) !== dir; dir = dirname(dir)) {
    const candidate = join(dir, 'apps', 'api', 'src', 'pages', 'assets');
    if (existsSync(join(candidate, 'review.js'))) return candidate;
  }
  throw new Error(`apps/api/src/pages/assets/review.js not found above ${start}`);
}

export class PageRenderer {
  private readonly pages: Record<PageName, Handlebars.TemplateDelegate>;
  private readonly assets: Record<string, Asset>;

  constructor(options: { templatesDir?: string; assetsDir?: string } = {}) {
    const pagesDir = join(options.templatesDir ?? findTemplatesDir(), 'pages');
    // Isolated from the report templates' helpers and partials.
    const hbs = Handlebars.create();
    const partialsDir = join(pagesDir, 'partials');
    for (const file of readdirSync(partialsDir)) {
      if (file.endsWith('.hbs')) hbs.registerPartial(basename(file, '.hbs'), readFileSync(join(partialsDir, file), 'utf8'));
    }
    const compile = (name: PageName) => hbs.compile(readFileSync(join(pagesDir, `${name}.hbs`), 'utf8'), { strict: true });
    this.pages = { queue: compile('queue'), revision: compile('revision'), audit: compile('audit') };
    const assetsDir = options.assetsDir ?? findAssetsDir();
    this.assets = {
      'review.js': { body: readFileSync(join(assetsDir, 'review.js'), 'utf8'), contentType: 'text/javascript; charset=utf-8' },
      'review.css': { body: readFileSync(join(assetsDir, 'review.css'), 'utf8'), contentType: 'text/css; charset=utf-8' },
    };
  }

  render(page: PageName, styleNonce?: string): string {
    return this.pages[page]({ page, title: TITLES[page], caution: CAUTION_TEXT, styleNonce: styleNonce ?? null });
  }

  asset(name: string): Asset | undefined {
    return Object.hasOwn(this.assets, name) ? this.assets[name] : undefined;
  }
}
