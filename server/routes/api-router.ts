import { Router, type Request, type Response } from "express";
import type { z } from "zod";
import type { AuthUser } from "../auth/sessions";
import { AppError } from "../errors";
import { hasAnyRole, type Role } from "../../shared/roles";
import { fieldPath } from "../../shared/schemas/field-path";
import { findUnpairedSurrogate, UNPAIRED_SURROGATE_MESSAGE } from "../../shared/schemas/well-formed-text";

/** Who may call a route: anyone, any signed-in person, or holders of at least one of the roles. */
export type Access = "public" | "signed-in" | readonly Role[];

export type HttpMethod = "get" | "post" | "put" | "patch" | "delete";

export interface RouteInfo {
  method: HttpMethod;
  /** Full path under /api, e.g. "/team/members/:id". */
  path: string;
  access: Access;
  /** the zod schemas the route validates its body and query with (the API contract's request schemas) */
  body?: z.ZodType;
  query?: z.ZodType;
}

export interface RouteInput<B, Q> {
  req: Request;
  res: Response;
  body: B;
  query: Q;
  /** The signed-in person; null only on public routes. */
  user: AuthUser | null;
}

interface RouteSpec<B, Q> {
  access: Access;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  handler: (input: RouteInput<B, Q>) => Promise<void>;
}

/**
 * An Express router that records every route with its access policy, checks sign-in (401) and role (403)
 * before anything else, then validates body and query with zod (400 naming each field).
 * The recorded table drives the access-control tests, so a new route cannot be left out of them.
 */
export class ApiRouter {
  readonly router = Router();
  readonly routes: RouteInfo[] = [];

  constructor(readonly prefix = "") {}

  get<Q = undefined>(path: string, spec: RouteSpec<undefined, Q>) { this.add("get", path, spec); }
  post<B = undefined, Q = undefined>(path: string, spec: RouteSpec<B, Q>) { this.add("post", path, spec); }
  put<B = undefined, Q = undefined>(path: string, spec: RouteSpec<B, Q>) { this.add("put", path, spec); }
  patch<B = undefined, Q = undefined>(path: string, spec: RouteSpec<B, Q>) { this.add("patch", path, spec); }
  delete<Q = undefined>(path: string, spec: RouteSpec<undefined, Q>) { this.add("delete", path, spec); }

  private add<B, Q>(method: HttpMethod, path: string, spec: RouteSpec<B, Q>): void {
    this.routes.push({ method, path: this.prefix + path, access: spec.access, body: spec.body, query: spec.query });
    this.router[method](path, async (req: Request, res: Response) => {
      const user = (res.locals.user as AuthUser | null | undefined) ?? null;
      authorize(spec.access, user);
      const body = spec.body ? parseInput(spec.body, req.body ?? {}, "body") : (undefined as B);
      const query = spec.query ? parseInput(spec.query, req.query, "query") : (undefined as Q);
      await spec.handler({ req, res, body, query, user });
    });
  }
}

function authorize(access: Access, user: AuthUser | null): void {
  if (access === "public") return;
  if (!user) throw new AppError("UNAUTHENTICATED", "Sign in first.");
  if (access === "signed-in") return;
  if (!hasAnyRole(user.roles, access)) throw new AppError("FORBIDDEN", `This needs the ${access.join(" or ")} role.`);
}

/**
 * Parses input with a zod schema; on failure a 400 whose message names the first field and whose `fields` name all.
 * Every body, query and upload field passes here, so this is also where text that is not valid Unicode (a lone
 * UTF-16 surrogate, which JSON can spell) is refused, before anything could store it.
 */
export function parseInput<T>(schema: z.ZodType<T>, value: unknown, where: "body" | "query" | "upload"): T {
  const unpaired = findUnpairedSurrogate(value);
  if (unpaired) {
    const path = unpaired.length ? fieldPath(unpaired) : where;
    throw new AppError("VALIDATION_FAILED", `${path}: ${UNPAIRED_SURROGATE_MESSAGE}`, { fields: { [path]: UNPAIRED_SURROGATE_MESSAGE } });
  }
  const parsed = schema.safeParse(value);
  if (parsed.success) return parsed.data;
  const fields: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    // A field the server does not take (or owns) is named by its own path, not its parent's: `sweepId`, not `body`.
    const keys = issue.code === "unrecognized_keys" ? issue.keys : [undefined];
    for (const key of keys) {
      const at = key === undefined ? issue.path : [...issue.path, key];
      const path = at.length ? fieldPath(at) : where;
      fields[path] ??= key === undefined ? issue.message : `${key} is not a field this request takes`;
    }
  }
  const [firstPath, firstMessage] = Object.entries(fields)[0];
  throw new AppError("VALIDATION_FAILED", `${firstPath}: ${firstMessage}`, { fields });
}
