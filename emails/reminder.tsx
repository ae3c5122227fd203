import { Heading, Text } from "@react-email/components";
import { EmailLayout } from "./email-layout";
import { ReminderFooter, ReminderItem, reminderStyles, reminderSubject, whenText, type ReminderLine } from "./reminder-parts";

export type ReminderEmailProps = {
  personName: string;
  orgName: string;
  line: ReminderLine;
  planUrl: string;
  choiceUrl: string;
};

/** One reminder, its own e-mail: the requirement, its date, why it came now, and what to do. */
export function reminderEmailSubject(props: Pick<ReminderEmailProps, "line">): string {
  return reminderSubject(props.line);
}

export default function ReminderEmail({ personName, orgName, line, planUrl, choiceUrl }: ReminderEmailProps) {
  return (
    <EmailLayout preview={`${line.title} ${whenText(line)}.`}>
      <Heading as="h1" style={reminderStyles.heading}>
        {line.lapsed ? `${line.title} has lapsed` : `${line.title} is coming up`}
      </Heading>
      <Text style={reminderStyles.text}>{`Hello ${personName},`}</Text>
      <ReminderItem line={line} withButton />
      <ReminderFooter planUrl={planUrl} choiceUrl={choiceUrl} orgName={orgName} />
    </EmailLayout>
  );
}
