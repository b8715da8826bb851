import type { RouteObject } from "react-router-dom";
import type { NavItem } from "@/components/layouts/app-layout";
import { paths } from "@/config/paths";
import type { AuthUserView as User } from "@shared/contracts";
import type { RouteLoad } from "@/app/router";

/** The run screens' routes inside the app frame (lazy; paths from @/config/paths). */
export function runRoutes(load: RouteLoad): RouteObject[] {
  const app = paths.app;
  // Static segments ("new", "report", "trials") outrank the ":runId" pattern in React Router's ranking.
  return [
    { path: app.runs.path, lazy: () => import("@/app/routes/app/runs/history").then(load) },
    { path: app.newRun.path, lazy: () => import("@/app/routes/app/runs/new-run").then(load) },
    { path: app.run.path, lazy: () => import("@/app/routes/app/runs/run").then(load) },
    { path: app.runTrial.path, lazy: () => import("@/app/routes/app/runs/run-trial").then(load) },
    { path: app.runReport.path, lazy: () => import("@/app/routes/app/runs/run-report").then(load) },
    { path: app.compare.path, lazy: () => import("@/app/routes/app/runs/compare").then(load) },
    { path: app.newSweep.path, lazy: () => import("@/app/routes/app/runs/new-sweep").then(load) },
    { path: app.sweep.path, lazy: () => import("@/app/routes/app/runs/sweep").then(load) },
  ];
}

/** Navigation entries for the run screens: every signed-in person reads run history and compares. */
export function runNavItems(user: User): NavItem[] {
  void user;
  return [
    { name: "Runs", to: paths.app.runs.getHref() },
    { name: "Compare", to: paths.app.compare.getHref() },
  ];
}
