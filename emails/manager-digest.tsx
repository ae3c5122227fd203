import { Heading, Link, Section, Text } from "@react-email/components";
import { formatCalendarDate } from "../app/components/calendar-date";
import { EmailLayout } from "./email-layout";
import { reminderStyles } from "./reminder-parts";

export type ManagerDigestEntry = {
  personName: string;
  units: string[];
  items: { title: string; status: "due-soon" | "lapsed"; dateMeaning: "due" | "valid-through"; date: string }[];
};

export type ManagerDigestEmailProps = {
  managerName: string;
  orgName: string;
  /** ISO week, e.g. "2026-W49". */
  week: string;
  unitNames: string[];
  people: ManagerDigestEntry[];
  /** Absolute address of the Team matrix filtered to what needs attention. */
  teamUrl: string;
};

function counts(people: ManagerDigestEntry[]) {
  let lapsed = 0;
  let dueSoon = 0;
  for (const p of people) {
    if (p.items.some((i) => i.status === "lapsed")) lapsed += 1;
    else dueSoon += 1;
  }
  return { lapsed, dueSoon };
}

/** The weekly digest to a manager: their units' people who are Due soon or Lapsed. */
export function managerDigestSubject({ week, people }: Pick<ManagerDigestEmailProps, "week" | "people">): string {
  const { lapsed, dueSoon } = counts(people);
  return `Weekly digest ${week}: ${lapsed} lapsed, ${dueSoon} due soon on your units`;
}

const STATUS_WORDS = { "due-soon": "Due soon", lapsed: "Lapsed" } as const;

export default function ManagerDigestEmail({ managerName, orgName, week, unitNames, people, teamUrl }: ManagerDigestEmailProps) {
  const { lapsed, dueSoon } = counts(people);
  return (
    <EmailLayout preview={`${lapsed} lapsed and ${dueSoon} due soon on your units this week.`}>
      <Heading as="h1" style={reminderStyles.heading}>
        Your units this week ({week})
      </Heading>
      <Text style={reminderStyles.text}>{`Hello ${managerName},`}</Text>
      <Text style={reminderStyles.text}>
        {`Every week ${orgName} sends each manager the people on their units (${unitNames.join(", ")}) who are Due soon or Lapsed. ${lapsed} ${lapsed === 1 ? "person has" : "people have"} something lapsed; ${dueSoon} more ${dueSoon === 1 ? "has" : "have"} something due soon.`}
      </Text>
      {people.map((p) => (
        <Section key={p.personName + p.units.join()} style={reminderStyles.item}>
          <Text style={reminderStyles.itemTitle}>{`${p.personName} (${p.units.join(", ")})`}</Text>
          {p.items.map((i) => (
            <Text key={i.title + i.date} style={reminderStyles.small}>
              {`${STATUS_WORDS[i.status]}: ${i.title} — ${i.dateMeaning === "due" ? "due" : "valid through"} ${formatCalendarDate(i.date)}`}
            </Text>
          ))}
        </Section>
      ))}
      <Text style={{ ...reminderStyles.small, marginTop: "20px" }}>
        <Link href={teamUrl} style={reminderStyles.link}>
          Open the Team matrix
        </Link>
      </Text>
    </EmailLayout>
  );
}
