// One diff for every audited write: exactly the fields whose value changed, with old and new values.
type Fields = Record<string, unknown>;

/** Dates as ISO text, everything else as its JSON form, so equal values compare equal whatever their type. */
const comparable = (v: unknown) => JSON.stringify(v instanceof Date ? v.toISOString() : (v ?? null));
const stored = (v: unknown) => (v instanceof Date ? v.toISOString() : (v ?? null));

/**
 * Compares the fields named in `after` (the values written; undefined = not written) with `before`.
 * Returns null when nothing changed, so a save without change leaves no entry.
 */
export function diffFields(before: Fields, after: Fields): { before: Fields; after: Fields } | null {
  const out = { before: {} as Fields, after: {} as Fields };
  let changed = false;
  for (const [key, value] of Object.entries(after)) {
    if (value === undefined) continue;
    if (comparable(before[key]) === comparable(value)) continue;
    out.before[key] = stored(before[key]);
    out.after[key] = stored(value);
    changed = true;
  }
  return changed ? out : null;
}
