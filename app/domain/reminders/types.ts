/** The part of `organisations.settings` the reminder policy lives in (kept structural: no schema import here). */
export type OrganisationSettingsLike = {
  reminderDays?: number[];
  reminderPolicy?: { weeklyWhileLapsed: boolean; boardMonthsBefore: number[]; managerDigest: boolean };
};
