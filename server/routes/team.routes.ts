import { IsNull } from "typeorm";
import type { AppContext } from "../context";
import { Invitation, User } from "../entities";
import { AppError, notFound } from "../errors";
import { presentInvitation, presentMember } from "../presenters/user.presenter";
import { inviteMember } from "../services/accounts";
import { createInvitationSchema, updateMemberSchema } from "../../shared/schemas/team";
import { ApiRouter } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";

/** People, roles and invitations (admin only). */
export function teamRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter("/team");
  const users = () => ctx.dataSource.getRepository(User);

  api.get("/members", {
    access: ACCESS.administer,
    handler: async ({ res }) => {
      const members = await users().find({ order: { name: "ASC" } });
      res.json({ members: members.map(presentMember) });
    },
  });

  api.patch("/members/:id", {
    access: ACCESS.administer,
    body: updateMemberSchema,
    handler: async ({ req, res, body }) => {
      const member = await users().findOneBy({ id: String(req.params.id) });
      if (!member) throw notFound("That member");
      const next = { ...member, ...definedOnly(body) };
      const losesAdmin = member.active && member.roles.includes("admin") && (!next.active || !next.roles.includes("admin"));
      if (losesAdmin && (await countActiveAdmins(ctx)) <= 1) {
        throw new AppError("LAST_ADMIN", "Lotwise needs at least one active admin; make someone else admin first.");
      }
      await users().update({ id: member.id }, { name: next.name, roles: next.roles, active: next.active });
      if (!next.active || body.roles) await ctx.sessions.invalidateAllFor(member.id);
      res.json({ member: presentMember(await users().findOneByOrFail({ id: member.id })) });
    },
  });

  api.get("/invitations", {
    access: ACCESS.administer,
    handler: async ({ res }) => {
      const invitations = await ctx.dataSource.getRepository(Invitation).find({ order: { createdAt: "DESC" }, relations: { invitedBy: true }, take: 200 });
      res.json({ invitations: invitations.map(presentInvitation) });
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
      const result = await ctx.dataSource.getRepository(Invitation).update({ id: String(req.params.id), acceptedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() });
      if (result.affected !== 1) throw notFound("An open invitation with that id");
      res.status(204).end();
    },
  });

  return api;
}

async function countActiveAdmins(ctx: AppContext): Promise<number> {
  const active = await ctx.dataSource.getRepository(User).findBy({ active: true });
  return active.filter((u) => u.roles.includes("admin")).length;
}

function definedOnly<T extends object>(value: T): Partial<T> {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as Partial<T>;
}
