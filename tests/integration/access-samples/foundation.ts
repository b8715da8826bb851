import request from "supertest";
import type { User } from "../../../server/entities";
import { inviteMember } from "../../../server/services/accounts";
import { ORIGIN, TEST_PASSWORD, type TestContext } from "../../helpers/test-context";
import type { SampleTable } from "./types";

let seq = 0;

async function openInvitationToken(t: TestContext, caller: User): Promise<string> {
  const email = `token-${++seq}@lotwise.test`;
  await inviteMember(t.ctx, caller, email, ["designer"]);
  const mail = (await t.outbox()).find((m) => m.to.includes(email))!;
  return mail.text.match(/invitation\/(\S+)/)![1];
}

export const foundationSamples: SampleTable = {
  "get /health": async () => ({ path: "/api/health" }),
  "get /outbox": async () => ({ path: "/api/outbox" }),
  "get /settings/compute-limits": async () => ({ path: "/api/settings/compute-limits" }),
  "put /settings/compute-limits": async () => ({ path: "/api/settings/compute-limits", body: { maxRunCost: 2e10, maxTrialCost: 3e6, maxExportCost: 1e9, maxExportSeconds: 60 } }),
  "get /auth/me": async () => ({ path: "/api/auth/me" }),
  "post /auth/sign-in": async (t) => {
    const u = await t.buildUser();
    return { path: "/api/auth/sign-in", body: { email: u.email, password: TEST_PASSWORD } };
  },
  "post /auth/sign-out": async () => ({ path: "/api/auth/sign-out" }),
  "get /auth/invitations/:token": async (t, caller) => ({ path: `/api/auth/invitations/${await openInvitationToken(t, caller)}` }),
  "post /auth/accept-invitation": async (t, caller) => ({
    path: "/api/auth/accept-invitation",
    body: { token: await openInvitationToken(t, caller), name: "Invitee", password: "a long enough password" },
  }),
  // A new address each time: requests are rate-limited per address (3 per 15 min), and the matrix calls this once per role.
  "post /auth/request-reset": async () => ({ path: "/api/auth/request-reset", body: { email: `someone-${++seq}@lotwise.test` } }),
  "post /auth/reset-password": async (t) => {
    const u = await t.buildUser();
    await request(t.app).post("/api/auth/request-reset").set("Origin", ORIGIN).send({ email: u.email }).expect(202);
    // the reset mail is sent off the response path: wait for it (a few seconds at most)
    let mail = (await t.outbox()).find((m) => m.to.includes(u.email));
    for (let k = 0; k < 50 && !mail; k++) {
      await new Promise((r) => setTimeout(r, 100));
      mail = (await t.outbox()).find((m) => m.to.includes(u.email));
    }
    if (!mail) throw new Error(`no reset mail reached ${u.email}`);
    return { path: "/api/auth/reset-password", body: { token: mail.text.match(/reset-password\/(\S+)/)![1], password: "a fresh long password" } };
  },
  "get /team/members": async () => ({ path: "/api/team/members" }),
  "patch /team/members/:id": async (t) => ({ path: `/api/team/members/${(await t.buildUser()).id}`, body: { roles: ["analyst"] } }),
  "get /team/invitations": async () => ({ path: "/api/team/invitations" }),
  "post /team/invitations": async () => ({ path: "/api/team/invitations", body: { email: `inv-${++seq}@lotwise.test`, roles: ["designer"] } }),
  "delete /team/invitations/:id": async (t, caller) => {
    const inv = await inviteMember(t.ctx, caller, `revoke-${++seq}@lotwise.test`, ["planner"]);
    return { path: `/api/team/invitations/${inv.id}` };
  },
};
