import type { RouteObject } from "react-router-dom";
import type { NavItem } from "@/components/layouts/app-layout";
import type { User } from "@/features/auth/api/types";
import type { RouteLoad } from "@/app/router";

/** The design screens' routes inside the app frame (lazy; paths from @/config/paths). */
export function designRoutes(load: RouteLoad): RouteObject[] {
  void load;
  return [];
}

/** Navigation entries for the design screens that work today. */
export function designNavItems(user: User): NavItem[] {
  void user;
  return [];
}
