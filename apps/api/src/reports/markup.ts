/**
 * Markup of the report's symbols and paths: registry plain text ("alpha_n", "d_r^2") as escaped HTML with Greek
 * letters, subscripts and superscripts, and dotted paths that may break after each dot. Used by the template helpers
 * (infra/templates.ts) only: prose and markup live in the templates, not in the view models.
 */

export const escapeHtml = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

const GREEK: Record<string, string> = { alpha: 'α', lambda: 'λ', sigma: 'σ', tau: 'τ', rho: 'ρ', beta: 'β', pi: 'π', omega: 'ω' };

/** Registry plain text with Greek letters and root signs in place ("alpha_n" -> "α_n"). */
export function mathText(text: string): string {
  return text
    .replace(/(?<![A-Za-z])(alpha|lambda|sigma|tau|rho|beta|pi|omega)(?![A-Za-z])/g, (w) => GREEK[w])
    .replace(/(?<![A-Za-z])sqrt(?![A-Za-z])/g, '√');
}

/** Plain-text symbols and equations from the registry ("alpha_n", "d_r^2") as escaped HTML with Greek, sub and sup. */
export function mathHtml(text: string): string {
  return escapeHtml(mathText(text))
    .replace(/([A-Za-zα-ω)'&#;39]+?)_([A-Za-z0-9]+(?:,[A-Za-z0-9]+)*)/g, (_m, base: string, sub: string) => `${base}<sub>${sub}</sub>`)
    .replace(/\^(\d+)/g, '<sup>$1</sup>')
    .replace(/ - /g, ' − ')
    .replace(/(^|[\s(=])-(?=[\s(/\dA-Za-zα-ω])/g, '$1−');
}

/** A dotted path as escaped HTML that may break after each dot. */
export function pathHtml(path: string): string {
  return escapeHtml(path).replace(/\./g, '.<wbr>');
}

