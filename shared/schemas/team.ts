import { z } from "zod";
import { emailSchema, roleListSchema } from "./auth";

export const createInvitationSchema = z.strictObject({ email: emailSchema, roles: roleListSchema });
export type CreateInvitationInput = z.infer<typeof createInvitationSchema>;

export const updateMemberSchema = z
  .strictObject({
    name: z.string().trim().min(1, { message: "is required" }).max(120).optional(),
    roles: roleListSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => v.name !== undefined || v.roles !== undefined || v.active !== undefined, {
    message: "give at least one of name, roles, active",
  });
export type UpdateMemberInput = z.infer<typeof updateMemberSchema>;
