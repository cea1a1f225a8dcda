/**
 * Escaping of text for the HTML and SVG the exports write. Every piece of
 * text that came from a file or the user goes through one of these.
 */

/**
 * Escape text for HTML element content and double- or single-quoted
 * attribute values (&, <, >, ", ' become character references).
 */
export function escapeHtml(text: unknown): string {
  return String(text)
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

/**
 * Escape text for HTML element content (&, < and > become character
 * references); quotes may stay, so text such as JSON reads as written.
 * Never use it inside an attribute value: use {@link escapeHtml} there.
 */
export function escapeText(text: unknown): string {
  return String(text).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}
