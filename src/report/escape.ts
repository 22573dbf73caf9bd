/**
 * Escaping at the two places user text and data enter a report: HTML text/attributes, and JSON
 * placed inside a <script> element (where `</script>` or `<!--` in a string would end or confuse it).
 */

const HTML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/** Escape text for HTML element content and double- or single-quoted attribute values. */
export function escapeHtml(text: unknown): string {
  return String(text).replace(/[&<>"']/g, (ch) => HTML_ESCAPES[ch] ?? ch);
}

/**
 * Text that the plotting library shows literally. Plotly reads a few HTML-like tags in legend, title, axis,
 * annotation and hover strings (<a href>, <b>, <i>, <br>, <sub>, <sup>, <span style>) and decodes &amp;, &lt; and
 * &gt;; escaping those three characters leaves no tag to form, and plotly turns the entities back into the user's
 * characters. Every user string that reaches a plot goes through this.
 */
export function plotlyText(text: unknown): string {
  return String(text).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/**
 * JSON for a `<script type="application/json">` block: `<`, `>`, `&` become \u003c, \u003e, \u0026 so
 * no string can close the element; U+2028/2029 are escaped too so the text also stays valid JavaScript.
 * JSON.parse restores the original characters.
 */
export function jsonForScript(value: unknown): string {
  const json = JSON.stringify(value) ?? 'null';
  return json
    .replace(/</g, '\\u003c')
    .replace(/>/g, '\\u003e')
    .replace(/&/g, '\\u0026')
    .replace(/\u2028/g, '\\u2028')
    .replace(/\u2029/g, '\\u2029');
}

/** A `<script type="application/json">` element with the given id holding `value`. */
export function jsonScriptElement(id: string, value: unknown): string {
  return `<script type="application/json" id="${escapeHtml(id)}">${jsonForScript(value)}</script>`;
}

/** Read back what jsonScriptElement wrote; undefined when the element is absent. */
export function readJsonScriptElement(html: string, id: string): unknown {
  const pattern = new RegExp(
    `<script type="application/json" id="${id.replace(/[^a-z0-9-]/gi, '')}">([^<]*)</script>`,
  );
  const match = pattern.exec(html);
  if (!match || match[1] === undefined) return undefined;
  return JSON.parse(match[1]) as unknown;
}
