/**
 * The Clearance board against a seeded copy of the demo database (issue 9 §3): it follows the
 * records — a lapsed annual check-off leaves what its requirement says, a new signed check-off
 * restores independence at once — it stays inside the viewer's organisation and units, and its
 * filters work. What a lapse leaves is the requirement's own setting (PRODUCT.md "Clearance");
 * the rest of the derivation is common practice, no source (app/domain/clearance).
 */
import { and, eq } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { signCheckoff } from "~/db/queries/checkoffs-signing.server";
import { markStep, requestCheckoff, setOutcome } from "~/db/queries/checkoffs-write.server";
import { checklists, checklistVersions, organisations, people, personRoles, requirements, units } from "~/db/schema";
import * as board from "~/routes/clearance/index";
import * as clearancesApi from "~/routes/api/v1/clearances";
import { ClearancePage } from "~/api/schemas";
import { createToken } from "~/api/token.server";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { args, getRequest, TEST_ORIGIN, viewerFor } from "../setup/request";
import { outcome } from "./admin-harness";
import { givePin, PINS } from "./checkoffs-harness";

type LoaderArgs = Parameters<typeof board.loader>[0];
type BoardData = Awaited<ReturnType<typeof board.loader>>;

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;
let manager: Viewer;
let abTherapist: Viewer;
let annual: { checklistId: string; skill: string; requirementName: string; lapseLeaves: string };

async function open(viewer: Viewer, search = ""): Promise<BoardData> {
  return board.loader(args<LoaderArgs>(getRequest(`/clearance${search}`), viewer));
}

function cellOf(data: BoardData, personName: string, skill: string, unitName?: string) {
  for (const b of data.boards) {
    if (unitName && b.unit.name !== unitName) continue;
    const person = b.people.find((p) => p.name === personName);
    const skillId = data.skills.find((s) => s.name === skill)?.checklistId;
    const cell = person?.cells.find((c) => c.checklistId === skillId);
    if (cell) return cell;
  }
  return undefined;
}

/** The therapist asks, the preceptor observes every step met, judges competent and signs — at `now`. */
async function signCompetent(person: Viewer, checklistId: string, now: Date): Promise<string> {
  const asked = await requestCheckoff(person, checklistId, now);
  if (!asked.ok) throw new Error(asked.message);
  const [version] = await db.db
    .select({ steps: checklistVersions.steps })
    .from(checklists)
    .innerJoin(checklistVersions, eq(checklistVersions.id, checklists.currentVersionId))
    .where(eq(checklists.id, checklistId));
  for (let i = 0; i < version.steps.length; i++) {
    const r = await markStep(preceptor, asked.value, { stepIndex: i, result: "met", comment: null }, now);
    if (!r.ok) throw new Error(r.message);
  }
  const o = await setOutcome(preceptor, asked.value, { outcome: "competent", practicePlan: null, practiceBy: null }, now);
  if (!o.ok) throw new Error(o.message);
  const signed = await signCheckoff(preceptor, asked.value, { email: null, pin: PINS.preceptor }, now);
  if (!signed.ok) throw new Error(signed.message);
  return asked.value;
}

beforeAll(async () => {
  db = await useSeededDatabase();
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(new Date(`${TEST_TODAY}T18:00:00Z`));
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
  await givePin(preceptor, PINS.preceptor);
  const [ab] = await db.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "alder-bay"));
  const [abPerson] = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(people.orgId, ab.id), eq(personRoles.role, "therapist")))
    .orderBy(people.email)
    .limit(1);
  abTherapist = await viewerFor(abPerson.email);
  // The demo's annual check-off requirement and the skill it renews.
  const [row] = await db.db
    .select({ checklistId: checklists.id, skill: checklists.skill, requirementName: requirements.name, lapseLeaves: requirements.lapseLeaves })
    .from(requirements)
    .innerJoin(checklists, eq(checklists.id, requirements.checklistId))
    .where(and(eq(requirements.orgId, therapist.org.id), eq(requirements.kind, "checklist"), eq(requirements.recurrence, "every-12-months")));
  annual = row;
});

afterEach(() => {
  vi.setSystemTime(new Date(`${TEST_TODAY}T18:00:00Z`));
});

afterAll(() => {
  vi.useRealTimers();
});

describe("the board follows the records", () => {
  it("moving now past a person's annual check-off leaves what the requirement says; a new signed check-off restores them at once", async () => {
    // The seed's annual requirement leaves "supervised" on a lapse; the demo therapist has no check-off of it yet.
    expect(annual.lapseLeaves).toBe("supervised");
    const name = therapist.person.name;
    const before = cellOf(await open(therapist), name, annual.skill);
    expect(before).toMatchObject({ level: "not-cleared" });
    expect(before!.reason).toMatch(/no competent check-off/i);

    // Signed a year ago (noon in Chicago): valid through TEST_TODAY inclusive, so independent today.
    await signCompetent(therapist, annual.checklistId, new Date("2025-12-02T18:00:00Z"));
    const today = cellOf(await open(therapist), name, annual.skill);
    expect(today).toMatchObject({ level: "independent" });
    expect(today!.reason).toMatch(/signed competent 2025-12-02/);

    // The next day the check-off has lapsed: supervised, as the requirement says, and the reason says why.
    vi.setSystemTime(new Date("2026-12-03T18:00:00Z"));
    const lapsedData = await open(therapist);
    expect(lapsedData.today).toBe("2026-12-03");
    const lapsed = cellOf(lapsedData, name, annual.skill);
    expect(lapsed).toMatchObject({ level: "supervised" });
    expect(lapsed!.reason).toContain(`${annual.requirementName} lapsed 2026-12-02`);
    expect(lapsed!.reason).toContain("the requirement leaves supervised");
    expect(lapsed!.reason).not.toContain("also:");

    // A new check-off signed that day restores independence on the very next read.
    await signCompetent(therapist, annual.checklistId, new Date("2026-12-03T18:00:00Z"));
    const restored = cellOf(await open(therapist), name, annual.skill);
    expect(restored).toMatchObject({ level: "independent" });
    expect(restored!.reason).toMatch(/signed competent 2026-12-03; .*current through 2027-12-03/);
  });

  it("GET /api/v1/clearances answers the board's cells, page by page, in the documented shape (one derivation)", async () => {
    const made = await createToken(manager.org.id, manager.person.id, { name: "clearance test", scopes: ["read"], expiresOn: null });
    const fromBoard = (await open(manager)).boards.flatMap((b) => b.people.flatMap((p) => p.cells.map((c) => `${p.id}|${c.unitId}|${c.checklistId}|${c.level}|${c.reason}`)));
    const fromApi: string[] = [];
    let cursor: string | null = null;
    do {
      const q: string = cursor ? `?limit=200&cursor=${encodeURIComponent(cursor)}` : "?limit=200";
      const response = (await clearancesApi.loader(args<never>(new Request(new URL(`/api/v1/clearances${q}`, TEST_ORIGIN), { headers: { Authorization: `Bearer ${made.token}` } }), null))) as Response;
      expect(response.status).toBe(200);
      const page = ClearancePage.parse(await response.json());
      for (const c of page.data) fromApi.push(`${c.personId}|${c.unitId}|${c.checklistId}|${c.level}|${c.reason}`);
      cursor = page.nextCursor;
    } while (cursor);
    expect(fromApi.length).toBeGreaterThan(200);
    expect(new Set(fromApi).size).toBe(fromApi.length);
    expect(fromApi.sort()).toEqual(fromBoard.sort());
    // The skill filter narrows the API as it narrows the board.
    const one = (await clearancesApi.loader(args<never>(new Request(new URL(`/api/v1/clearances?limit=200&checklistId=${annual.checklistId}`, TEST_ORIGIN), { headers: { Authorization: `Bearer ${made.token}` } }), null))) as Response;
    const filtered = ClearancePage.parse(await one.json());
    expect(filtered.data.length).toBeGreaterThan(0);
    expect(new Set(filtered.data.map((c) => c.checklistId))).toEqual(new Set([annual.checklistId]));
  });
});

describe("who sees which board", () => {
  it("a therapist sees their own units' boards; a manager every unit of the organisation", async () => {
    const [home] = await db.db.select({ name: units.name }).from(units).where(eq(units.id, therapist.person.homeUnitId!));
    const mine = await open(therapist);
    expect(mine.boards.map((b) => b.unit.name)).toContain(home.name);
    const orgUnits = await db.db.select({ name: units.name }).from(units).where(and(eq(units.orgId, manager.org.id), eq(units.active, true)));
    expect(mine.boards.length).toBeLessThan(orgUnits.length);
    expect(mine.boards.find((b) => b.unit.name === home.name)!.people.map((p) => p.name)).toContain(therapist.person.name);
    const all = await open(manager);
    expect(all.boards.map((b) => b.unit.name).sort()).toEqual(orgUnits.map((u) => u.name).sort());
    // Every cell carries a level and a reason in words.
    for (const b of all.boards) for (const p of b.people) for (const c of p.cells) expect(c.reason.length).toBeGreaterThan(10);
  });

  it("a therapist of another organisation sees nothing of this one, not even by naming its unit or skill", async () => {
    const ours = await open(manager);
    const ourPeople = new Set(ours.boards.flatMap((b) => b.people.map((p) => p.id)));
    const ourUnits = ours.boards.map((b) => b.unit.id);
    const theirs = await open(abTherapist);
    expect(theirs.boards.length).toBeGreaterThan(0);
    for (const b of theirs.boards) {
      expect(ourUnits).not.toContain(b.unit.id);
      for (const p of b.people) expect(ourPeople.has(p.id)).toBe(false);
    }
    expect(theirs.skills.map((s) => s.checklistId)).not.toContain(annual.checklistId);
    const probing = await open(abTherapist, `?unit=${ourUnits[0]}&skill=${annual.checklistId}`);
    expect(probing.boards).toEqual([]);
    expect(probing.problem).toMatch(/not one whose board you can see/);
    expect(JSON.stringify(probing)).not.toContain(therapist.person.name);
  });

  it("a therapist cannot open another unit's board by its id", async () => {
    const all = await open(manager);
    const other = all.boards.find((b) => !b.people.some((p) => p.id === therapist.person.id))!;
    const data = await open(therapist, `?unit=${other.unit.id}`);
    expect(data.boards).toEqual([]);
    expect(data.problem).toMatch(/not one whose board you can see/);
  });

  it("the admin role alone has no board (403)", async () => {
    const admin = await viewerFor("admin@kestrelvalley.test");
    const answer = await outcome(board.loader(args<LoaderArgs>(getRequest("/clearance"), admin)));
    expect(answer.status).toBe(403);
  });
});

describe("filters", () => {
  it("by unit: one unit's board only", async () => {
    const all = await open(manager);
    const unit = all.boards[1].unit;
    const data = await open(manager, `?unit=${unit.id}`);
    expect(data.boards.map((b) => b.unit.name)).toEqual([unit.name]);
    expect(data.boards[0].people.map((p) => p.id)).toEqual(all.boards[1].people.map((p) => p.id));
  });

  it("by skill: every board keeps only that skill's column", async () => {
    const data = await open(manager, `?skill=${annual.checklistId}`);
    expect(data.shownSkills.map((s) => s.name)).toEqual([annual.skill]);
    expect(data.skills.length).toBeGreaterThan(1);
    for (const b of data.boards) for (const p of b.people) expect(p.cells.map((c) => c.checklistId)).toEqual([annual.checklistId]);
  });

  it("an unknown skill is named as such, not widened to every skill", async () => {
    const data = await open(manager, "?skill=no-such-skill");
    expect(data.boards).toEqual([]);
    expect(data.problem).toMatch(/not one of your organisation's published checklists/);
  });
});
