import type { QueryClient } from "@tanstack/react-query";
import { Navigate, Outlet, useLocation, useNavigate } from "react-router-dom";
import { hasAnyRole } from "@shared/roles";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { AppLayout, type NavItem } from "@/components/layouts/app-layout";
import { LoadingRegion } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getMeQueryOptions, useMe } from "@/features/auth/api/get-me";
import { useSignOut } from "@/features/auth/api/sign-out";
import type { User } from "@/features/auth/api/types";
import { HealthIndicator } from "@/features/health/components/health-indicator";
import type { AppOutletContext } from "@/app/routes/app/app-context";

/** Knows who is signed in before the frame renders, so there is no flash of the wrong page. */
export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getMeQueryOptions());
  return null;
};

/** Only the screens that work today; more join as they are built. */
function navItemsFor(user: User): NavItem[] {
  const items: NavItem[] = [{ name: "Overview", to: paths.app.overview.getHref(), end: true }];
  if (hasAnyRole(user.roles, ["admin"])) {
    items.push({ name: "Team", to: paths.app.team.getHref() });
    items.push({ name: "Outbox", to: paths.app.outbox.getHref() });
  }
  return items;
}

/** The signed-in frame. Without a session it sends the visitor to sign-in, remembering where to. */
export default function AppRoot() {
  const me = useMe();
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut();

  if (me.isPending) return <LoadingRegion label="Checking your session…" />;
  if (me.isError) throw me.error;
  if (!me.data) {
    const next = `${location.pathname}${location.search}`;
    return <Navigate to={paths.auth.signIn.getHref(next)} replace />;
  }

  const user = me.data;
  function handleSignOut() {
    signOut.mutate(undefined, {
      onSettled: () => navigate(paths.auth.signIn.getHref(), { replace: true }),
    });
  }

  return (
    <AppLayout
      navItems={navItemsFor(user)}
      user={user}
      onSignOut={handleSignOut}
      signingOut={signOut.isPending}
      status={<HealthIndicator />}
    >
      <RegionBoundary region="This page">
        <Outlet context={{ user } satisfies AppOutletContext} />
      </RegionBoundary>
    </AppLayout>
  );
}
