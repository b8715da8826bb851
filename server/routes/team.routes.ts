import type { AppContext } from "../context";
import { presentInvitation, presentMember } from "../presenters/user.presenter";
import { inviteMember } from "../services/accounts";
import { listInvitations, listMembers, revokeInvitation, updateMember } from "../services/team";
import { createInvitationSchema, updateMemberSchema } from "../../shared/schemas/team";
import { ApiRouter } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";

/** People, roles and invitations (admin only); the data work is in services/team.ts. */
export function teamRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter("/team");

  api.get("/members", {
    access: ACCESS.administer,
    handler: async ({ res }) => {
      res.json({ members: (await listMembers(ctx)).map(presentMember) });
    },
  });

  api.patch("/members/:id", {
    access: ACCESS.administer,
    body: updateMemberSchema,
    handler: async ({ req, res, body }) => {
      res.json({ member: presentMember(await updateMember(ctx, String(req.params.id), body)) });
    },
  });

  api.get("/invitations", {
    access: ACCESS.administer,
    handler: async ({ res }) => {
      res.json({ invitations: (await listInvitations(ctx)).map(presentInvitation) });
    },
  });

  api.post("/invitations", {
    access: ACCESS.administer,
    body: createInvitationSchema,
    handler: async ({ res, body, user }) => {
      const invitation = await inviteMember(ctx, user!, body.email, body.roles);
      res.status(201).json({ invitation: presentInvitation(invitation) });
    },
  });

  api.delete("/invitations/:id", {
    access: ACCESS.administer,
    handler: async ({ req, res }) => {
      await revokeInvitation(ctx, String(req.params.id));
      res.status(204).end();
    },
  });

  return api;
}
