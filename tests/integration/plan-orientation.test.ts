import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { orientationPlans, people } from "~/db/schema";
import { loader } from "~/routes/plan/index";
import { args, getRequest, viewerFor } from "../setup/request";
import { useSeededDatabase } from "../setup/db";

type LoaderArgs = Parameters<typeof loader>[0];
let db: Database;
beforeAll(async () => {
  db = await useSeededDatabase();
});

describe("My plan shows a new hire's orientation plan", () => {
  it("lists the plan with its parts for the new hire, and none for a therapist without one", async () => {
    const [newHire] = await db.db
      .select({ email: people.email })
      .from(orientationPlans)
      .innerJoin(people, eq(people.id, orientationPlans.personId))
      .limit(1);
    const data = await loader(args<LoaderArgs>(getRequest("/plan"), await viewerFor(newHire.email)));
    expect(data.orientation).toHaveLength(1);
    expect(data.orientation[0].items.length).toBeGreaterThan(0);

    const therapist = await loader(args<LoaderArgs>(getRequest("/plan"), await viewerFor("therapist@kestrelvalley.test")));
    expect(therapist.orientation).toEqual([]);
  });
});

describe("the demo's new hires stand at different stages", () => {
  it("their plans show different progress, and every seeded signature holds against its record", async () => {
    const { listOrientationPlans } = await import("~/db/queries/checkoffs-orientation.server");
    const { getCheckoffRecord } = await import("~/db/queries/checkoffs.server");
    const { signaturesHold } = await import("~/db/queries/checkoffs-signing.server");
    const { checkoffs } = await import("~/db/schema");
    const kv = await viewerFor("manager@kestrelvalley.test");
    const plans = await listOrientationPlans(kv.org.id, { kind: "all" });
    const done = plans.map((p) => p.items.filter((i) => i.done).length).sort((a, b) => a - b);
    expect(plans).toHaveLength(3);
    expect(new Set(done).size).toBe(3);

    // Both organisations' seeded check-offs (Alder Bay has some since the authorisation matrix
    // needs them), each read in its own organisation.
    const seeded = await db.db.select({ id: checkoffs.id, orgId: checkoffs.orgId }).from(checkoffs).where(eq(checkoffs.status, "acknowledged"));
    expect(seeded.some((c) => c.orgId === kv.org.id)).toBe(true);
    expect(new Set(seeded.map((c) => c.orgId)).size).toBe(2);
    for (const { id, orgId } of seeded) {
      const record = await getCheckoffRecord(orgId, id);
      expect(record?.signatures).toHaveLength(2);
      expect(signaturesHold(record!).every((s) => s.holds)).toBe(true);
    }
  });
});
