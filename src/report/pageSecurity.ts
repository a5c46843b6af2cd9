/**
 * What keeps the page safe and offline: the Content-Security-Policy, the escaping every user string
 * passes through, and JSON that cannot close the script element it travels in.
 */

/** The Content-Security-Policy of the page: nothing may be fetched; inline scripts and styles run. */
export const contentSecurityPolicy =
  "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data: blob:; " +
  "font-src 'none'; connect-src 'none'; base-uri 'none'; form-action 'none'";

/**
 * Escapes text for HTML element content and quoted attribute values: `&`, `<`, `>`, `"` and `'`
 * become character references. The one function every user string passes through.
 */
export function escapeHtml(text: string): string {
  return text
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/**
 * JSON for a `<script type="application/json">` element: `<`, `>` and `&` as `\u003c`, `\u003e` and
 * `\u0026`, which `JSON.parse` reads back unchanged but which cannot end the element.
 */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(/</g, "\\u003c").replace(/>/g, "\\u003e").replace(/&/g, "\\u0026");
}
