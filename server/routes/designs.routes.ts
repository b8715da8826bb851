import type { AppContext } from "../context";
import { ApiRouter } from "./api-router";

/** (being built) */
export function designsRoutes(ctx: AppContext): ApiRouter {
  void ctx;
  return new ApiRouter();
}
