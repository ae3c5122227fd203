/**
 * The rows one organisation's scenario is made of, table by table, before they are written.
 * Builders fill a Dataset in memory (pure, deterministic); seeds/apply.ts writes it.
 */
import type {
  assignments,
  attempts,
  certificates,
  checklists,
  checklistVersions,
  credentials,
  credentialTypes,
  exams,
  examVersions,
  files,
  items,
  itemVersions,
  itemVersionTopics,
  organisations,
  orientationPlanItems,
  checkoffs,
  checkoffStepResults,
  signatures,
  orientationPlans,
  people,
  personRoles,
  personUnits,
  regulatoryReferences,
  requirements,
  responses,
  topics,
  units,
  waivers,
} from "../app/db/schema";

/** Tables in the order they are inserted (parents before children). */
export type Dataset = {
  organisations: (typeof organisations.$inferInsert)[];
  units: (typeof units.$inferInsert)[];
  people: (typeof people.$inferInsert)[];
  personRoles: (typeof personRoles.$inferInsert)[];
  personUnits: (typeof personUnits.$inferInsert)[];
  topics: (typeof topics.$inferInsert)[];
  regulatoryReferences: (typeof regulatoryReferences.$inferInsert)[];
  credentialTypes: (typeof credentialTypes.$inferInsert)[];
  exams: (typeof exams.$inferInsert)[];
  items: (typeof items.$inferInsert)[];
  itemVersions: (typeof itemVersions.$inferInsert)[];
  itemVersionTopics: (typeof itemVersionTopics.$inferInsert)[];
  examVersions: (typeof examVersions.$inferInsert)[];
  checklists: (typeof checklists.$inferInsert)[];
  checklistVersions: (typeof checklistVersions.$inferInsert)[];
  requirements: (typeof requirements.$inferInsert)[];
  /** Seeded uploads (credential scans, seeds/scans.ts); their bytes are written by writeSeededFiles. */
  files: (typeof files.$inferInsert)[];
  credentials: (typeof credentials.$inferInsert)[];
  waivers: (typeof waivers.$inferInsert)[];
  assignments: (typeof assignments.$inferInsert)[];
  /** Graded past sittings of an exam (seeds/exam-history.ts), so item analysis has data. */
  attempts: (typeof attempts.$inferInsert)[];
  responses: (typeof responses.$inferInsert)[];
  orientationPlans: (typeof orientationPlans.$inferInsert)[];
  orientationPlanItems: (typeof orientationPlanItems.$inferInsert)[];
  checkoffs: (typeof checkoffs.$inferInsert)[];
  checkoffStepResults: (typeof checkoffStepResults.$inferInsert)[];
  signatures: (typeof signatures.$inferInsert)[];
  /** Certificates of the signed competent check-offs (seeds/certificates.ts). */
  certificates: (typeof certificates.$inferInsert)[];
};

export function emptyDataset(): Dataset {
  return {
    organisations: [],
    units: [],
    people: [],
    personRoles: [],
    personUnits: [],
    topics: [],
    regulatoryReferences: [],
    credentialTypes: [],
    exams: [],
    items: [],
    itemVersions: [],
    itemVersionTopics: [],
    examVersions: [],
    checklists: [],
    checklistVersions: [],
    requirements: [],
    files: [],
    credentials: [],
    waivers: [],
    assignments: [],
    attempts: [],
    responses: [],
    orientationPlans: [],
    orientationPlanItems: [],
    checkoffs: [],
    checkoffStepResults: [],
    signatures: [],
    certificates: [],
  };
}

/** Row counts per table, for the summary and the audit detail. */
export function countRows(data: Dataset): Record<keyof Dataset, number> {
  return Object.fromEntries(Object.entries(data).map(([k, rows]) => [k, rows.length])) as Record<keyof Dataset, number>;
}
