/*
 * Small DOM helpers shared by every page. API data reaches a page only through these (text nodes and
 * attributes), never as markup.
 */

export function $(id) {
  return document.getElementById(id);
}

/** An element with attributes and children; strings become text nodes, so nothing is parsed as markup. */
export function el(tag, attrs, ...children) {
  const node = document.createElement(tag);
  for (const [key, value] of Object.entries(attrs || {})) {
    if (value === undefined || value === null || value === false) continue;
    if (key === 'class') node.className = value;
    else node.setAttribute(key, value === true ? '' : String(value));
  }
  for (const child of children.flat()) {
    if (child === undefined || child === null || child === false) continue;
    node.append(typeof child === 'number' ? String(child) : child);
  }
  return node;
}

/** The id in a path such as /review/revisions/:id, by a pattern with one capture. */
export function pathId(pattern) {
  const m = pattern.exec(location.pathname);
  return m ? decodeURIComponent(m[1]) : '';
}

/** A table body's rows replaced by `rows`; the table hidden and the `empty` note shown when there are none. */
export function fillTable(table, rows, empty) {
  table.tBodies[0].replaceChildren(...rows);
  table.hidden = rows.length === 0;
  if (empty) empty.hidden = rows.length > 0;
}
