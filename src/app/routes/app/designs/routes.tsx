import type { RouteObject } from "react-router-dom";
import type { NavItem } from "@/components/layouts/app-layout";
import type { AuthUserView as User } from "@shared/contracts";
import type { RouteLoad } from "@/app/router";
import { paths } from "@/config/paths";

/** The design screens' routes inside the app frame (lazy; paths from @/config/paths). */
export function designRoutes(load: RouteLoad): RouteObject[] {
  return [
    { path: paths.app.designs.path, lazy: () => import("@/app/routes/app/designs/designs-list").then(load) },
    { path: paths.app.newDesign.path, lazy: () => import("@/app/routes/app/designs/new-design").then(load) },
    { path: paths.app.design.path, lazy: () => import("@/app/routes/app/designs/design").then(load) },
    { path: paths.app.designLimits.path, lazy: () => import("@/app/routes/app/designs/design-limits").then(load) },
    { path: paths.app.grades.path, lazy: () => import("@/app/routes/app/designs/grades").then(load) },
  ];
}

/** Navigation entries for the design screens: every signed-in person reads designs and grades. */
export function designNavItems(user: User): NavItem[] {
  void user;
  return [
    { name: "Designs", to: paths.app.designs.getHref() },
    { name: "Grades", to: paths.app.grades.getHref() },
  ];
}
