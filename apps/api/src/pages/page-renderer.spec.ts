import { join } from 'node:path';
import { CAUTION_TEXT } from '../reports/report-model';
import { contentSecurityPolicy, findAssetsDir, PAGE_SPECS, PAGES, PageRenderer } from './page-renderer';

describe('PageRenderer', () => {
  const renderer = new PageRenderer();

  it('renders every page shell with the safety caution, its stylesheet and script, and no inline code', () => {
    for (const page of PAGES) {
      const html = renderer.render(page);
      expect(html).toContain(`<body data-page="${page}">`);
      expect(html).toContain(`<script type="module" src="/review/assets/${PAGE_SPECS[page].script}"></script>`);
      for (const sentence of CAUTION_TEXT) expect(html).toContain(sentence);
      expect(html).not.toMatch(/<style|style=|<script>|\son[a-z]+=/);
    }
  });

  it('puts the style nonce in the revision page only when given one', () => {
    expect(renderer.render('revision', 'abc123')).toContain('<meta name="leadline-style-nonce" content="abc123">');
    expect(renderer.render('queue')).not.toContain('leadline-style-nonce');
  });

  it('serves the script modules and stylesheets of the assets folder, and nothing else', () => {
    for (const page of PAGES) expect(renderer.asset(PAGE_SPECS[page].script)?.contentType).toBe('text/javascript; charset=utf-8');
    expect(renderer.asset('lib-api.js')?.contentType).toBe('text/javascript; charset=utf-8');
    expect(renderer.asset('review.css')?.contentType).toBe('text/css; charset=utf-8');
    expect(renderer.asset('../pages.module.ts')).toBeUndefined();
    expect(renderer.asset('toString')).toBeUndefined();
  });

  it('finds the assets from the compiled output too (tsc copies no .js/.css assets into dist)', () => {
    const repo = join(__dirname, '../../../..');
    expect(findAssetsDir(join(repo, 'dist/apps/api/src/pages'))).toBe(join(__dirname, 'assets'));
  });
});

describe('contentSecurityPolicy', () => {
  it('allows nothing from outside, no inline code, no fonts, no form submission', () => {
    expect(contentSecurityPolicy()).toBe(
      "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; font-src 'none'; frame-src 'none'; " +
        "object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
    );
    expect(contentSecurityPolicy('00ff')).toContain("style-src 'self' 'nonce-00ff';");
  });
});
