import type { AppContext } from "../context";
import { presentMeasured, presentRevision } from "../presenters/design.presenter";
import {
  addMeasured, addRevision, createDesign, deleteMeasured, designDetail, designViews, findDesign, findMeasured, findRevision, latestRevision, listDesigns, replaceRevision, updateDesign,
} from "../services/designs";
import { measuredFromUpload, netlistFromUpload } from "../services/revision-files";
import { receiveUpload } from "../middlewares/receive-upload";
import { MEASURED_UPLOAD_LIMIT, REVISION_UPLOAD_LIMIT } from "../services/uploads";
import type { Netlist } from "../../shared/engine/netlist";
import {
  createDesignSchema, listDesignsQuerySchema, measuredUploadFieldsSchema, replaceRevisionSchema, revisionBodySchema, revisionUploadFieldsSchema, updateDesignSchema,
} from "../../shared/schemas/design";
import { ApiRouter, parseInput } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";


/** Designs, revisions (typed or uploaded) and measured responses. Reads are open to every signed-in person. */
export function designsRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();
  const id = (params: Record<string, unknown>) => String(params.id);

  api.get("/designs", {
    access: "signed-in",
    query: listDesignsQuerySchema,
    handler: async ({ res, query }) => {
      res.json({ designs: await listDesigns(ctx, query.archived === "true") });
    },
  });

  api.post("/designs", {
    access: ACCESS.editDesigns,
    body: createDesignSchema,
    handler: async ({ res, body, user }) => {
      const { design, revision } = await createDesign(ctx, user!, body);
      const [view] = await designViews(ctx, [design]);
      res.status(201).json({ design: view, revision: presentRevision(revision) });
    },
  });

  api.get("/designs/:id", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json(await designDetail(ctx, id(req.params)));
    },
  });

  api.patch("/designs/:id", {
    access: ACCESS.editDesigns,
    body: updateDesignSchema,
    handler: async ({ req, res, body }) => {
      const [view] = await designViews(ctx, [await updateDesign(ctx, id(req.params), body)]);
      res.json({ design: view });
    },
  });

  api.get("/revisions/:id", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json({ revision: presentRevision(await findRevision(ctx, id(req.params))) });
    },
  });

  api.post("/designs/:id/revisions", {
    access: ACCESS.editDesigns,
    body: revisionBodySchema,
    handler: async ({ req, res, body, user }) => {
      const revision = await addRevision(ctx, user!, id(req.params), { ...body, netlist: body.netlist as Netlist });
      res.status(201).json({ revision: presentRevision(revision) });
    },
  });

  api.put("/revisions/:id", {
    access: ACCESS.editDesigns,
    body: replaceRevisionSchema,
    handler: async ({ req, res, body }) => {
      const revision = await replaceRevision(ctx, id(req.params), { ...body, netlist: body.netlist as Netlist });
      res.json({ revision: presentRevision(revision) });
    },
  });

  api.post("/designs/:id/revisions/upload", {
    access: ACCESS.editDesigns,
    handler: async ({ req, res, user }) => {
      const designId = id(req.params);
      await findDesign(ctx, designId);
      const { file, fields } = await receiveUpload(req, res, REVISION_UPLOAD_LIMIT);
      const { note } = parseInput(revisionUploadFieldsSchema, fields, "upload");
      const latest = await latestRevision(ctx, designId);
      const netlist = netlistFromUpload(file, latest);
      const revision = await addRevision(ctx, user!, designId, { netlist, note: note ?? `uploaded ${file.fileName}`, parentId: latest.id });
      res.status(201).json({ revision: presentRevision(revision) });
    },
  });

  api.post("/designs/:id/measured", {
    access: ACCESS.uploadMeasured,
    handler: async ({ req, res, user }) => {
      const designId = id(req.params);
      await findDesign(ctx, designId);
      const { file, fields } = await receiveUpload(req, res, MEASURED_UPLOAD_LIMIT);
      const { name } = parseInput(measuredUploadFieldsSchema, fields, "upload");
      const data = measuredFromUpload(file);
      const measured = await addMeasured(ctx, { designId, name: name ?? file.fileName.replace(/\.s[12]p$/i, "").slice(0, 120), fileName: file.fileName.slice(0, 255), data, uploadedById: user!.id });
      res.status(201).json({ measured: { id: measured.id, name: measured.name, fileName: measured.fileName, points: data.freqs.length } });
    },
  });

  api.get("/measured/:id", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json({ measured: presentMeasured(await findMeasured(ctx, id(req.params))) });
    },
  });

  api.delete("/measured/:id", {
    access: ACCESS.editDesigns,
    handler: async ({ req, res }) => {
      await deleteMeasured(ctx, id(req.params));
      res.status(204).end();
    },
  });

  return api;
}
