// Apart from masses.schema.ts (zod), which the masses page loads only when its form is first checked.

/**
 * Fill factors travel in the form keyed by item id; a form field name splits on ".", so the id's "."
 * and "+" (allowed in ids) are written "~d" and "~p" ("~" is not allowed in an id, so this is reversible).
 */
export function fillKey(itemId: string): string {
  return itemId.replace(/\./g, "~d").replace(/\+/g, "~p");
}

export function itemIdOfFillKey(key: string): string {
  return key.replace(/~d/g, ".").replace(/~p/g, "+");
}
