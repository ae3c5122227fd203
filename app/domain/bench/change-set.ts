/**
 * Applies an event's "set" (any patient, settings or limits field) to the live copies the
 * engine holds. Field names are unique across the three groups, so a flat set is
 * unambiguous; an effort change is merged into the current effort. Values are assumed
 * validated (schema.ts) — the engine trusts them.
 */
import type { ChangeSet, Limits, Patient, Settings } from "./types";

type Bag = Record<string, unknown>;

/** Returns true when the effort changed (the effort source must be told). */
export function applyChangeSet(settings: Settings, limits: Limits, patient: Patient, set: ChangeSet): boolean {
  let effortChanged = false;
  for (const [key, value] of Object.entries(set)) {
    if (value === undefined) continue;
    if (key === "effort") {
      const merged: Bag = { ...patient.effort };
      for (const [field, v] of Object.entries(value as Bag)) if (v !== undefined) merged[field] = v;
      patient.effort = merged as unknown as Patient["effort"];
      effortChanged = true;
    } else if (key === "complianceMlPerCmH2O" || key === "resistanceCmH2OPerLps") {
      patient[key] = value as number;
    } else if (key in limits) {
      (limits as unknown as Bag)[key] = value;
    } else if (key in settings) {
      (settings as unknown as Bag)[key] = value;
    }
  }
  return effortChanged;
}
