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
