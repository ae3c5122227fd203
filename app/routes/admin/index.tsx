import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { useMemo } from "react";
import { data, Form, useActionData, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField, TextField, fromConform } from "~/components/ui/field";
import { getOrganisationSettings, updateOrganisationSettings } from "~/db/queries/admin.server";
import { createOrganisationSchema } from "./schemas";
import type { Route } from "./+types/index";

/**
 * The time zones the server knows (IANA names from its ICU data). The organisation's current
 * zone is kept even if this runtime lists it under another name (Asia/Kolkata is listed as
 * Asia/Calcutta by some ICU versions), so saving the name alone never fails on the zone.
 */
function timeZonesFor(current: string): string[] {
  const zones = Intl.supportedValuesOf("timeZone");
  return zones.includes(current) ? zones : [current, ...zones].sort();
}

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "org:settings");
  const settings = await getOrganisationSettings(viewer.org.id);
  if (!settings) notFound();
  return { settings, timeZones: timeZonesFor(settings.timeZone) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "org:settings");
  const current = await getOrganisationSettings(viewer.org.id);
  if (!current) notFound();
  const submission = parseWithZod(await request.formData(), { schema: createOrganisationSchema(timeZonesFor(current.timeZone)) });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const changed = await updateOrganisationSettings(viewer.org.id, viewer.person.id, submission.value);
  const fields = Object.keys(changed).length;
  return redirectWithToast("/admin", fields === 0 ? "Nothing changed, so nothing was saved." : "Organisation settings saved.");
}

export default function OrganisationSettings() {
  const { settings, timeZones } = useLoaderData<typeof loader>();
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const schema = useMemo(() => createOrganisationSchema(timeZones), [timeZones]);
  const zoneOptions = useMemo(() => timeZones.map((z) => ({ value: z, label: z.replace(/_/g, " ") })), [timeZones]);
  const [form, fields] = useForm({
    id: "organisation",
    lastResult,
    defaultValue: {
      name: settings.name,
      timeZone: settings.timeZone,
      educationLeadName: settings.educationLeadName ?? "",
      contactEmail: settings.contactEmail ?? "",
    },
    constraint: getZodConstraint(schema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema }),
  });
  const saving = navigation.state === "submitting";
  return (
    <section aria-labelledby="organisation-heading" className="flex max-w-2xl flex-col gap-4">
      <h2 id="organisation-heading" className="text-2xl font-semibold">
        Organisation settings
      </h2>
      <p className="text-muted">
        These appear on certificates and reminder e-mails. Every due date and expiry in Tidemark is a calendar date in the
        organisation&rsquo;s time zone.
      </p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <TextField
          key={fields.name.key}
          {...fromConform(fields.name)}
          label="Organisation name"
          autoComplete="organization"
          required
        />
        <SelectField
          key={fields.timeZone.key}
          {...fromConform(fields.timeZone)}
          label="Time zone"
          hint="The zone of the hospital's clock (IANA name), for example America/Chicago."
          options={zoneOptions}
          required
        />
        <TextField
          key={fields.educationLeadName.key}
          {...fromConform(fields.educationLeadName)}
          label="Education lead's printed name (optional)"
          hint="Printed on certificates beside the signature line."
          autoComplete="off"
        />
        <TextField
          key={fields.contactEmail.key}
          {...fromConform(fields.contactEmail)}
          label="Contact e-mail (optional)"
          hint="Where staff write with questions about their requirements; shown in reminder e-mails."
          type="email"
          inputMode="email"
          autoComplete="off"
        />
        <div>
          <Button type="submit" disabled={saving}>
            {saving ? "Saving…" : "Save settings"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Organisation settings · Admin · Tidemark" }];
