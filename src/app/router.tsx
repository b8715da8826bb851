import type { ComponentType } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, Outlet, type LoaderFunction } from "react-router-dom";
import { RouteError } from "@/components/errors/route-error";
import { LoadingRegion } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { designRoutes } from "@/app/routes/app/designs/routes";
import { runRoutes } from "@/app/routes/app/runs/routes";

export type RouteModule = {
  default: ComponentType;
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
};

/** Turns a route module (default component + optional `clientLoader(queryClient)`) into a lazy route. */
export type RouteLoad = ReturnType<typeof convert>;

function convert(queryClient: QueryClient) {
  return ({ default: Component, clientLoader }: RouteModule) =>
    clientLoader ? { Component, loader: clientLoader(queryClient) } : { Component };
}

function HydrateFallback() {
  return (
    <div className="flex min-h-screen items-center justify-center">
      <LoadingRegion label="Starting Lotwise…" />
    </div>
  );
}

export function createAppRouter(queryClient: QueryClient) {
  const load = convert(queryClient);
  return createBrowserRouter([
    {
      element: <Outlet />,
      errorElement: <RouteError />,
      HydrateFallback,
      children: [
        { path: paths.auth.signIn.path, lazy: () => import("@/app/routes/auth/sign-in").then(load) },
        { path: paths.auth.forgotPassword.path, lazy: () => import("@/app/routes/auth/forgot-password").then(load) },
        { path: paths.auth.resetPassword.path, lazy: () => import("@/app/routes/auth/reset-password").then(load) },
        { path: paths.auth.invitation.path, lazy: () => import("@/app/routes/auth/invitation").then(load) },
        {
          path: paths.app.root.path,
          lazy: () => import("@/app/routes/app/root").then(load),
          children: [
            { index: true, lazy: () => import("@/app/routes/app/overview").then(load) },
            ...designRoutes(load),
            ...runRoutes(load),
            { path: paths.app.team.path, lazy: () => import("@/app/routes/app/team").then(load) },
            { path: paths.app.outbox.path, lazy: () => import("@/app/routes/app/outbox").then(load) },
            { path: "*", lazy: () => import("@/app/routes/not-found").then(load) },
          ],
        },
      ],
    },
  ]);
}
