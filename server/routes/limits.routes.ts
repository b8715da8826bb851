import type { AppContext } from "../context";
import { presentGrade, presentLimitSet } from "../presenters/design.presenter";
import {
  createGrade, createLimitSet, deleteGrade, deleteLimitSet, listGrades, listLimitSets, updateGrade, updateLimitSet,
} from "../services/limit-sets";
import { gradeBodySchema, limitSetBodySchema } from "../../shared/schemas/design";
import { ApiRouter } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";

/** Acceptance limit sets per design and the grade catalogue (planners edit; everyone signed in reads). */
export function limitsRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();
  const id = (params: Record<string, unknown>) => String(params.id);

  api.get("/designs/:id/limit-sets", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json({ limitSets: (await listLimitSets(ctx, id(req.params))).map(presentLimitSet) });
    },
  });

  api.post("/designs/:id/limit-sets", {
    access: ACCESS.editLimits,
    body: limitSetBodySchema,
    handler: async ({ req, res, body, user }) => {
      res.status(201).json({ limitSet: presentLimitSet(await createLimitSet(ctx, user!, id(req.params), body)) });
    },
  });

  api.put("/limit-sets/:id", {
    access: ACCESS.editLimits,
    body: limitSetBodySchema,
    handler: async ({ req, res, body }) => {
      res.json({ limitSet: presentLimitSet(await updateLimitSet(ctx, id(req.params), body)) });
    },
  });

  api.delete("/limit-sets/:id", {
    access: ACCESS.editLimits,
    handler: async ({ req, res }) => {
      await deleteLimitSet(ctx, id(req.params));
      res.status(204).end();
    },
  });

  api.get("/grades", {
    access: "signed-in",
    handler: async ({ res }) => {
      res.json({ grades: (await listGrades(ctx)).map(presentGrade) });
    },
  });

  api.post("/grades", {
    access: ACCESS.editLimits,
    body: gradeBodySchema,
    handler: async ({ res, body }) => {
      res.status(201).json({ grade: presentGrade(await createGrade(ctx, body)) });
    },
  });

  api.put("/grades/:id", {
    access: ACCESS.editLimits,
    body: gradeBodySchema,
    handler: async ({ req, res, body }) => {
      res.json({ grade: presentGrade(await updateGrade(ctx, id(req.params), body)) });
    },
  });

  api.delete("/grades/:id", {
    access: ACCESS.editLimits,
    handler: async ({ req, res }) => {
      await deleteGrade(ctx, id(req.params));
      res.status(204).end();
    },
  });

  return api;
}
