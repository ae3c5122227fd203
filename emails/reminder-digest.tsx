import { Heading, Text } from "@react-email/components";
import { formatLongCalendarDate } from "../app/components/calendar-date";
import { EmailLayout } from "./email-layout";
import { ReminderFooter, ReminderItem, reminderStyles, type ReminderLine } from "./reminder-parts";

export type ReminderDigestEmailProps = {
  personName: string;
  orgName: string;
  /** The organisation's calendar date of the digest. */
  today: string;
  lines: ReminderLine[];
  planUrl: string;
  choiceUrl: string;
};

/** The daily digest for a person who chose one e-mail a day: every reminder due today, lapsed first. */
export function reminderDigestSubject({ lines, today }: Pick<ReminderDigestEmailProps, "lines" | "today">): string {
  const lapsed = lines.filter((l) => l.lapsed).length;
  const count = lines.length === 1 ? "1 reminder" : `${lines.length} reminders`;
  return `Your Tidemark reminders for ${formatLongCalendarDate(today)}: ${count}${lapsed > 0 ? `, ${lapsed} lapsed` : ""}`;
}

export default function ReminderDigestEmail({ personName, orgName, today, lines, planUrl, choiceUrl }: ReminderDigestEmailProps) {
  const ordered = [...lines].sort((a, b) => Number(b.lapsed) - Number(a.lapsed) || a.daysLeft - b.daysLeft);
  return (
    <EmailLayout preview={`${lines.length} reminder${lines.length === 1 ? "" : "s"} from ${orgName}.`}>
      <Heading as="h1" style={reminderStyles.heading}>
        Your reminders for {formatLongCalendarDate(today)}
      </Heading>
      <Text style={reminderStyles.text}>{`Hello ${personName},`}</Text>
      <Text style={reminderStyles.text}>You chose one daily digest instead of separate e-mails. Today it holds:</Text>
      {ordered.map((line) => (
        <ReminderItem key={`${line.title}-${line.dueOn}`} line={line} withButton={false} />
      ))}
      <ReminderFooter planUrl={planUrl} choiceUrl={choiceUrl} orgName={orgName} />
    </EmailLayout>
  );
}
