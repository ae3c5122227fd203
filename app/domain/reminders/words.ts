/** How a threshold reads in an e-mail and on Admin → Reminders. */
export function describeThreshold(threshold: string): string {
  if (threshold === "on-day") return "on the day";
  const lapsed = /^lapsed-(\d{4})-W(\d{2})$/.exec(threshold);
  if (lapsed) return `weekly while lapsed (week ${Number(lapsed[2])} of ${lapsed[1]})`;
  const days = /^(\d+)d$/.exec(threshold);
  if (days) return days[1] === "1" ? "1 day before" : `${days[1]} days before`;
  const months = /^(\d+)m$/.exec(threshold);
  if (months) return months[1] === "1" ? "1 month before" : `${months[1]} months before`;
  return threshold;
}
