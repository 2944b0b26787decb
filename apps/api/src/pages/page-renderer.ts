/**
 * The web pages (/review for the checking engineer, /design for the design author): Handlebars shells compiled
 * once, and the script modules and stylesheets they load, read from disk once. The shells carry no data; each
 * page's module fetches everything from the JSON API with the user's token.
 */
import { browserModuleSource } from '@leadline/presentation';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { TOLERANCE_CLASSES } from '@leadline/mechanics';
import { ACKNOWLEDGEMENT_MIN_LENGTH } from '@leadline/contracts';
import { CAUTION_TEXT } from '../reports/report-model';
import { Templates, type Template } from '../infra/templates';

/** The standard that defines each form's tolerance classes, for the design form's choice of class. */
const TOLERANCE_STANDARDS: Readonly<Record<string, string>> = { trapezoidal: 'ISO 2903', acme: 'ASME B1.5' };

/** The tolerance classes the engine holds, one option per class, tagged with its thread form. */
const TOLERANCE_OPTIONS = Object.entries(TOLERANCE_CLASSES).flatMap(([form, classes]) =>
  (classes ?? []).map((c) => ({ form, value: c, label: `${c} (${TOLERANCE_STANDARDS[form] ?? form}, nut/screw)` })),
);

/** One page: its shell (templates/pages/<name>.hbs), window title and script module (pages/assets). */
interface PageSpec {
  readonly title: string;
  readonly script: string;
}

/** Every page. Adding one: a template, a script module, an entry here and a route in a pages controller. */
export const PAGE_SPECS = {
  queue: { title: 'Review queue', script: 'review-queue.js' },
  revision: { title: 'Revision under review', script: 'review-revision.js' },
  audit: { title: 'Audit trail', script: 'review-audit.js' },
  'design-products': { title: 'Products', script: 'design-products.js' },
  'design-product': { title: 'Product', script: 'design-product.js' },
  'design-calculation': { title: 'Calculation', script: 'design-calculation.js' },
  'design-my-work': { title: 'My work', script: 'design-my-work.js' },
  'design-form': { title: 'Screw design', script: 'design-form.js' },
  'sign-in': { title: 'Sign in', script: 'sign-in.js' },
  'admin-users': { title: 'Users', script: 'admin-users.js' },
  account: { title: 'Your account', script: 'account.js' },
} as const satisfies Record<string, PageSpec>;

export type PageName = keyof typeof PAGE_SPECS;
export const PAGES = Object.keys(PAGE_SPECS) as PageName[];

/** The presentation module as the pages import it (generated from libs/presentation at start). */
export const PRESENTATION_ASSET = 'lib-presentation.js';

/** Where the pages' assets are served (one place for /review and /design). */
export const ASSET_BASE = '/review/assets/';

export interface Asset {
  readonly body: string;
  readonly contentType: string;
}

const CONTENT_TYPES: Record<string, string> = { '.js': 'text/javascript; charset=utf-8', '.css': 'text/css; charset=utf-8' };

/**
 * The pages' Content-Security-Policy: nothing from outside, no inline script or style, no plugins, no form
 * submission (forms are handled by the script, so a token can never be submitted into a URL).
 * The revision page adds a per-response nonce to style-src: the report it shows in the page itself is rendered by
 * the service with that nonce on its style blocks (report.html?part=embedded). No page shows a frame.
 */
export function contentSecurityPolicy(styleNonce?: string): string {
  return [
    "default-src 'self'",
    "script-src 'self'",
    `style-src 'self'${styleNonce ? ` 'nonce-${styleNonce}'` : ''}`,
    "img-src 'self' data:",
    "font-src 'none'",
    "frame-src 'none'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'none'",
    "frame-ancestors 'none'",
  ].join('; ');
}

const MARKER = 'lib-api.js';

/** Finds pages/assets beside this file (source) or in the repository above it (dist, where tsc copies no assets). */
export function findAssetsDir(start: string = __dirname): string {
  const beside = join(start, 'assets');
  if (existsSync(join(beside, MARKER))) return beside;
  for (let dir = start; dirname(dir) !== dir; dir = dirname(dir)) {
    const candidate = join(dir, 'apps', 'api', 'src', 'pages', 'assets');
    if (existsSync(join(candidate, MARKER))) return candidate;
  }
  throw new Error(`apps/api/src/pages/assets/${MARKER} not found above ${start}`);
}

export class PageRenderer {
  private readonly pages: Record<string, Template<Record<string, unknown>>>;
  private readonly assets: Record<string, Asset>;

  /** Whether the sign-in page offers the identity provider (LEADLINE_OIDC_ISSUER set) */
  private readonly oidc: boolean;

  constructor(options: { templatesDir?: string; assetsDir?: string; oidc?: boolean } = {}) {
    this.oidc = options.oidc ?? false;
    // The service's one Handlebars environment (infra/templates.ts)
    const templates = Templates.of(options.templatesDir);
    this.pages = Object.fromEntries(PAGES.map((name) => [name, templates.template<Record<string, unknown>>(`pages/${name}`)]));
    const assetsDir = options.assetsDir ?? findAssetsDir();
    this.assets = {};
    for (const file of readdirSync(assetsDir)) {
      const type = CONTENT_TYPES[file.slice(file.lastIndexOf('.'))];
      if (type && /^[a-z0-9-]+\.(js|css)$/.test(file)) this.assets[file] = { body: readFileSync(join(assetsDir, file), 'utf8'), contentType: type };
    }
    // Numbers, units, words and dates: the server's own presentation module, not a copy (libs/presentation)
    this.assets[PRESENTATION_ASSET] = { body: browserModuleSource(), contentType: CONTENT_TYPES['.js'] };
  }

  render(page: PageName, styleNonce?: string): string {
    const spec: PageSpec = PAGE_SPECS[page];
    return this.pages[page]({
      page, title: spec.title, script: ASSET_BASE + spec.script, caution: CAUTION_TEXT, styleNonce: styleNonce ?? null, oidc: this.oidc,
      frictionSurfaces: [{ surface: 'thread' }, { surface: 'collar' }],
      toleranceOptions: TOLERANCE_OPTIONS,
      pressureSteps: [{ n: 1, i: 0 }, { n: 2, i: 1 }, { n: 3, i: 2 }],
      acknowledgementMinLength: ACKNOWLEDGEMENT_MIN_LENGTH,
    });
  }

  asset(name: string): Asset | undefined {
    return Object.hasOwn(this.assets, name) ? this.assets[name] : undefined;
  }

  /** Names of every served asset. */
  assetNames(): string[] {
    return Object.keys(this.assets);
  }
}
