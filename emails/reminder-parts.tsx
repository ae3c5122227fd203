import { Button, Link, Section, Text } from "@react-email/components";
import type { CSSProperties } from "react";
import { formatCalendarDate, formatLongCalendarDate } from "../app/components/calendar-date";
import { emailColours } from "./email-layout";

/** One reminder as an e-mail shows it: what, which date, why now, and where to act. */
export type ReminderLine = {
  title: string;
  kind: "exam" | "checklist" | "credential";
  /** "due" for work not done, "valid-through" for a card or a met requirement. */
  dateMeaning: "due" | "valid-through";
  dueOn: string;
  /** Days from today to `dueOn`; negative once past. */
  daysLeft: number;
  lapsed: boolean;
  /** Why this e-mail came, e.g. "30 days before". */
  thresholdWords: string;
  /** Absolute address of what to do. */
  actionUrl: string;
  actionLabel: string;
};

export const reminderStyles = {
  heading: { color: emailColours.ink, fontSize: "22px", fontWeight: 700, margin: "0 0 16px" },
  text: { color: emailColours.ink, fontSize: "16px", lineHeight: "24px", margin: "0 0 14px" },
  small: { color: emailColours.ink, fontSize: "14px", lineHeight: "20px", margin: "0 0 10px" },
  item: { borderTop: `1px solid ${emailColours.rule}`, padding: "12px 0 4px" },
  itemTitle: { color: emailColours.ink, fontSize: "17px", fontWeight: 700, lineHeight: "24px", margin: "0 0 4px" },
  button: {
    backgroundColor: emailColours.sea,
    borderRadius: "6px",
    color: "#FFFFFF",
    fontSize: "16px",
    fontWeight: 600,
    padding: "12px 20px",
    textDecoration: "none",
  },
  link: { color: emailColours.sea, textDecoration: "underline" },
} satisfies Record<string, CSSProperties>;

function days(n: number): string {
  return n === 1 ? "1 day" : `${n} days`;
}

/** "due on Thursday 10 December 2026 (in 8 days)", "valid through … (lapsed 2 days ago)". */
export function whenText(line: Pick<ReminderLine, "dateMeaning" | "dueOn" | "daysLeft" | "lapsed">): string {
  const date = formatLongCalendarDate(line.dueOn);
  const verb = line.dateMeaning === "due" ? (line.lapsed ? "was due on" : "is due on") : line.lapsed ? "was valid through" : "is valid through";
  const left = line.daysLeft > 0 ? `in ${days(line.daysLeft)}` : line.daysLeft === 0 ? "today" : `${days(-line.daysLeft)} ago`;
  return `${verb} ${date} (${left})`;
}

/** A one-line subject for a single reminder. */
export function reminderSubject(line: Pick<ReminderLine, "title" | "dateMeaning" | "dueOn" | "lapsed">): string {
  const date = formatCalendarDate(line.dueOn);
  if (line.lapsed) return `Lapsed: ${line.title} — ${line.dateMeaning === "due" ? "was due" : "valid through"} ${date}`;
  return `Reminder: ${line.title} — ${line.dateMeaning === "due" ? "due" : "valid through"} ${date}`;
}

export function ReminderItem({ line, withButton }: { line: ReminderLine; withButton: boolean }) {
  return (
    <Section style={reminderStyles.item}>
      <Text style={reminderStyles.itemTitle}>{line.title}</Text>
      <Text style={reminderStyles.small}>{`${line.lapsed ? "Lapsed: it" : "It"} ${whenText(line)}.`}</Text>
      <Text style={reminderStyles.small}>{`Why now: your organisation reminds you ${line.thresholdWords}.`}</Text>
      {withButton ? (
        <Button href={line.actionUrl} style={reminderStyles.button}>
          {line.actionLabel}
        </Button>
      ) : (
        <Text style={reminderStyles.small}>
          <Link href={line.actionUrl} style={reminderStyles.link}>
            {line.actionLabel}
          </Link>
        </Text>
      )}
    </Section>
  );
}

/** The closing lines every reminder e-mail shares: where the plan is, and how to change the choice. */
export function ReminderFooter({ planUrl, choiceUrl, orgName }: { planUrl: string; choiceUrl: string; orgName: string }) {
  return (
    <>
      <Text style={{ ...reminderStyles.small, marginTop: "20px" }}>
        {`Everything you owe, soonest first, is on My plan: ${planUrl}`}
      </Text>
      <Text style={reminderStyles.small}>
        {`${orgName} sends these reminders from Tidemark. To get one daily digest instead of separate e-mails (or back), choose here: ${choiceUrl}`}
      </Text>
    </>
  );
}
