/**
 * The certificate pages as the server renders them from their real loaders (issue 9 §2): the
 * public /verify page shows the name, what was met, the dates and the state and nothing else of
 * the certificate (no code, no signer, no organisation's records); the certificate page offers the
 * download, and the revoke form to a manager of the holder's unit only; Credentials lists the
 * holder's certificates. Server rendering only: the browser and axe are in
 * tests/e2e/certificates.spec.ts.
 */
import { asc, eq } from "drizzle-orm";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { certificates } from "~/db/schema";
import * as certificatePage from "~/routes/credentials/certificate";
import * as credentialsPage from "~/routes/credentials/index";
import * as verifyPage from "~/routes/verify";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";

let db: Database;
let therapist: Viewer;
let manager: Viewer;
let cert: typeof certificates.$inferSelect;

type AnyRoute = { loader: (a: never) => Promise<unknown>; default: unknown };

async function render(route: AnyRoute, viewer: Viewer | null, path: string, params: Record<string, string>): Promise<string> {
  const data = await route.loader(args<never>(getRequest(path), viewer, params));
  const Page = route.default as unknown as (props: Record<string, unknown>) => React.ReactElement;
  const Component = () => <Page loaderData={data} actionData={undefined} params={params} matches={[]} />;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component }]);
  const context = await handler.query(new Request(`http://localhost${path}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
  [cert] = await db.db.select().from(certificates).where(eq(certificates.personId, therapist.person.id)).orderBy(asc(certificates.createdAt)).limit(1);
});

describe("certificate pages", () => {
  it("/verify shows the name, what was met, the dates and Valid — not the code, the signer or anything else", async () => {
    const html = await render(verifyPage as unknown as AnyRoute, null, `/verify/${cert.code}`, { code: cert.code });
    expect(html).toContain("Certificate check");
    expect(html).toContain(therapist.person.name);
    expect(html).toContain(cert.title);
    expect(html).toContain(`<time dateTime="${cert.issuedOn}"`);
    expect(html).toContain("No expiry");
    expect(html).toContain('data-state="valid"');
    expect(html).toContain(">Valid<");
    expect(html).not.toContain(cert.code);
    expect(html).not.toContain(cert.signerName);
    expect(html).toContain("licensed clinical judgement");
  });

  it("the holder sees the details and the download, without a revoke form", async () => {
    const html = await render(certificatePage as unknown as AnyRoute, therapist, `/credentials/certificates/${cert.id}`, { certificateId: cert.id });
    expect(html).toContain(cert.code);
    expect(html).toContain(cert.signerName);
    expect(html).toContain(`href="/credentials/certificates/${cert.id}/certificate.pdf"`);
    expect(html).toContain(`href="/verify/${cert.code}"`);
    expect(html).not.toContain("Revoke this certificate");
  });

  it("a manager of the holder's unit sees the revoke form, with a labelled reason", async () => {
    const html = await render(certificatePage as unknown as AnyRoute, manager, `/credentials/certificates/${cert.id}`, { certificateId: cert.id });
    expect(html).toContain("Revoke this certificate");
    expect(html).toMatch(/<label[^>]*for="revoke-reason"[^>]*>Reason for revoking/);
  });

  it("Credentials lists the holder's certificates with the details link and the download", async () => {
    const html = await render(credentialsPage as unknown as AnyRoute, therapist, "/credentials", {});
    expect(html).toContain("Your certificates");
    expect(html).toContain(`href="/credentials/certificates/${cert.id}"`);
    expect(html).toContain(`href="/credentials/certificates/${cert.id}/certificate.pdf"`);
  });
});
