/**
 * The /team/requirements page as the server renders it, from its real loader: the "New
 * requirement" form's labelled fields, each requirement's change form with recurrence and
 * audience, the retire button that asks twice, and the retired list with "Bring back".
 * Server rendering only (the Playwright axe scan of this page is in tests/e2e/credentials-team.spec.ts).
 */
import { and, eq, ne } from "drizzle-orm";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { setRequirementActive } from "~/db/queries/requirements-write.server";
import { exams, requirements } from "~/db/schema";
import * as route from "~/routes/team/requirements";
import { args, getRequest } from "../setup/request";
import { useTodayPlanTeamWorld } from "./today-plan-team-harness";

type LoaderArgs = Parameters<typeof route.loader>[0];

const world = useTodayPlanTeamWorld();

async function render(viewer: Viewer): Promise<string> {
  const data = await route.loader(args<LoaderArgs>(getRequest("/team/requirements"), viewer));
  const Page = route.default as unknown as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "requirements", path: "/team/requirements", loader: () => data, action: () => null, Component: Page }]);
  const context = await handler.query(new Request("http://localhost/team/requirements"));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  // React separates adjacent text with empty comments; drop them so the text reads as on screen.
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

/** A label bound by id to a control of the given tag. */
const labelled = (label: string, tag: "select" | "input") => new RegExp(`<label for="([^"]+)"[^>]*>${label}</label>[\\s\\S]*?<${tag}[^>]*id="\\1"`);

describe("the requirements page", () => {
  it("offers an educator a labelled New requirement form with only the organisation's published exams", async () => {
    const educator = world.viewers.educator;
    const html = await render(educator);
    const form = html.slice(html.indexOf('id="new-heading"'), html.indexOf('id="edit-heading"'));
    expect(form).toContain("New requirement");
    for (const [label, tag] of [
      ["Name", "input"],
      ["Kind", "select"],
      ["Exam", "select"],
      ["Recurrence", "select"],
      ["Unit", "select"],
      ["Role", "select"],
      ["Grace period \\(days\\)", "input"],
      ["Regulatory reference", "select"],
      ["A lapse leaves", "select"],
    ] as const)
      expect(form).toMatch(labelled(label, tag));
    // Roles a requirement can be aimed at: the four clinical roles, not admin.
    for (const role of ["Therapist", "Preceptor", "Educator", "Manager"]) expect(form).toContain(`>${role}</option>`);
    expect(form).not.toContain(">Admin</option>");
    const published = await world.db.db.select({ title: exams.title }).from(exams).where(and(eq(exams.orgId, educator.org.id), eq(exams.status, "published")));
    const unpublished = await world.db.db.select({ title: exams.title }).from(exams).where(and(eq(exams.orgId, educator.org.id), ne(exams.status, "published")));
    for (const e of published) expect(form).toContain(`>${e.title}</option>`);
    for (const e of unpublished) if (!published.some((p) => p.title === e.title)) expect(form).not.toContain(`>${e.title}</option>`);
    expect(form).toContain("Add requirement");
  });

  it("gives every requirement a change form with recurrence and audience and a retire button; ids are unique", async () => {
    const educator = world.viewers.educator;
    const html = await render(educator);
    const active = await world.db.db.select({ name: requirements.name, kind: requirements.kind }).from(requirements).where(and(eq(requirements.orgId, educator.org.id), eq(requirements.active, true)));
    for (const r of active) {
      expect(html).toContain(`aria-label="Change ${r.name}"`);
      expect(html).toContain(`Retire ${r.name}`);
    }
    // Recurrence only where it applies (exams and check-offs; a credential's type decides).
    const recurrenceSelects = html.match(/<select[^>]*name="recurrence"/g) ?? [];
    expect(recurrenceSelects.length).toBe(active.filter((r) => r.kind !== "credential").length + 1);
    expect((html.match(/<select[^>]*name="unitId"/g) ?? []).length).toBe(active.length + 1);
    expect((html.match(/<select[^>]*name="role"/g) ?? []).length).toBe(active.length + 1);
    // Duplicate ids break label binding (and fail axe's duplicate-id rules).
    const ids = [...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
    expect(ids.length).toBeGreaterThan(50);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it("lists a retired requirement under Retired requirements with Bring back, and no longer offers it for change", async () => {
    const manager = world.viewers.manager;
    const [req] = await world.db.db.select({ id: requirements.id, name: requirements.name }).from(requirements).where(and(eq(requirements.orgId, manager.org.id), eq(requirements.active, true))).limit(1);
    expect(await setRequirementActive(manager.org.id, manager.person.id, req.id, false)).toEqual({ ok: true, id: req.id });
    try {
      const html = await render(manager);
      const retired = html.slice(html.indexOf('id="retired-heading"'));
      expect(retired).toContain("Retired requirements");
      expect(retired).toContain(req.name);
      expect(retired).toContain(`Bring back<span class="sr-only"> ${req.name}</span>`);
      expect(html).not.toContain(`aria-label="Change ${req.name}"`);
    } finally {
      await setRequirementActive(manager.org.id, manager.person.id, req.id, true);
    }
  });
});
