const ENTITIES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/**
 * Text for an HTML string: `& < > " '` as entities, safe in element content and in quoted attributes.
 * ECharts puts a tooltip formatter's return value into the page as HTML, and series names come from people
 * (a measured response is named after its uploaded file), so every such name goes through here.
 * null and undefined become "".
 */
export function escapeHtml(value: unknown): string {
  return String(value ?? "").replace(/[&<>"']/g, (c) => ENTITIES[c]);
}
