/**
 * The one serialisation of an exchange document as a file: JSON, two-space indented, ending in a
 * newline. The export answers it and the report attaches it, so the attachment of an issued report
 * and the export of the unchanged case are the same bytes (and the SHA-256 printed in the report
 * can be checked against either).
 */
export function exchangeDocumentText(doc: unknown): string {
  return `${JSON.stringify(doc, null, 2)}\n`;
}

/**
 * A JSON document whose bytes do not depend on the order of its keys (sorted at every level, compact
 * as the command line writes results, newline at the end): for documents that are stored in
 * PostgreSQL's jsonb, which keeps no key order, and must serialise to the same bytes after the round trip.
 */
export function stableDocumentText(doc: unknown): string {
  return `${JSON.stringify(sortKeys(doc))}\n`;
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value === null || typeof value !== "object") return value;
  return Object.fromEntries(
    Object.keys(value)
      .sort()
      .map((k) => [k, sortKeys((value as Record<string, unknown>)[k])]),
  );
}
