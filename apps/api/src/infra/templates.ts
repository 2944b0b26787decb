/**
 * The one Handlebars environment of the service: every template (templates/reports, templates/pages) and every
 * partial (templates/partials for the reports, templates/pages/partials for the pages) is registered here, once per
 * templates folder, with the helpers the templates use. Templates are compiled on first use and kept.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import Handlebars from 'handlebars';
import { mathHtml, pathHtml } from '../reports/markup';

const MARKER = join('reports', 'calculation-report.hbs');

/** Finds the repository's templates/ folder from this file (source or dist) or the working directory. */
export function findTemplatesDir(start: string = __dirname): string {
  for (let dir = start; ; dir = dirname(dir)) {
    const candidate = join(dir, 'templates');
    if (existsSync(join(candidate, MARKER))) return candidate;
    if (dirname(dir) === dir) break;
  }
  const fromCwd = resolve('templates');
  if (existsSync(join(fromCwd, MARKER))) return fromCwd;
  throw new Error(`templates/${MARKER} not found above ${start} or in the working directory`);
}

export type Template<T = unknown> = Handlebars.TemplateDelegate<T>;

export class Templates {
  private static readonly byDir = new Map<string, Templates>();
  private static compilationsCount = 0;
  private readonly hbs = Handlebars.create();
  private readonly compiled = new Map<string, Template<never>>();
  /** Each partial's source as registered (Handlebars replaces its own copy by a compiled function on first use). */
  private readonly partialSources = new Map<string, string>();

  private constructor(readonly dir: string) {
    const hbs = this.hbs;
    hbs.registerHelper('eq', (a: unknown, b: unknown) => a === b);
    hbs.registerHelper('inc', (i: unknown) => Number(i) + 1);
    hbs.registerHelper('concat', (...parts: unknown[]) => parts.slice(0, -1).map(String).join(''));
    // Both escape their argument before adding markup.
    hbs.registerHelper('math', (text: unknown) => new hbs.SafeString(mathHtml(text === undefined || text === null ? '' : String(text))));
    hbs.registerHelper('dottedPath', (text: unknown) => new hbs.SafeString(pathHtml(String(text ?? ''))));
    for (const folder of [join(dir, 'partials'), join(dir, 'pages', 'partials'), join(dir, 'reports', 'sections')]) {
      if (!existsSync(folder)) continue;
      for (const file of readdirSync(folder)) {
        if (!file.endsWith('.hbs')) continue;
        const name = basename(file, '.hbs');
        if (hbs.partials[name] !== undefined) throw new Error(`two partials are named "${name}" (${folder})`);
        const source = readFileSync(join(folder, file), 'utf8');
        this.partialSources.set(name, source);
        hbs.registerPartial(name, source);
      }
    }
  }

  /** The environment of a templates folder (default: the repository's), created once. */
  static of(dir: string = findTemplatesDir()): Templates {
    let t = Templates.byDir.get(dir);
    if (t === undefined) Templates.byDir.set(dir, (t = new Templates(dir)));
    return t;
  }

  /** How many templates were compiled in this process (each once per folder). */
  static compilations(): number {
    return Templates.compilationsCount;
  }

  /**
   * A template by its path under templates/ without ".hbs" ("reports/calculation-report", "pages/queue"), or a
   * partial by its name ("report-body"). Pages compile strict (a missing field is an error); reports do not.
   */
  template<T>(name: string): Template<T> {
    let t = this.compiled.get(name);
    if (t === undefined) {
      const file = join(this.dir, `${name}.hbs`);
      const source = existsSync(file) ? readFileSync(file, 'utf8') : this.partialSources.get(name);
      if (typeof source !== 'string') throw new Error(`no template or partial "${name}" in ${this.dir}`);
      t = this.hbs.compile(source, name.startsWith('pages/') ? { strict: true } : { strict: false, preventIndent: true });
      this.compiled.set(name, t);
      Templates.compilationsCount++;
    }
    return t as Template<T>;
  }
}
