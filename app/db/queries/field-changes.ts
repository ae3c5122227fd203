/**
 * The "before and after" of an edit, for audit events: only the fields that really changed,
 * so the history says what happened and an unchanged save writes nothing.
 */
export type FieldChanges = Record<string, { before: unknown; after: unknown }>;

export function fieldChanges<T extends Record<string, unknown>>(before: T, after: Partial<T>): FieldChanges {
  const changes: FieldChanges = {};
  for (const key of Object.keys(after) as (keyof T & string)[]) {
    const was = before[key] ?? null;
    const now = after[key] ?? null;
    if (JSON.stringify(was) !== JSON.stringify(now)) changes[key] = { before: was, after: now };
  }
  return changes;
}
