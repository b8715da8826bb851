import type { QueryClient } from "@tanstack/react-query";
import { Navigate, Outlet, useLocation } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { AppLayout, type NavItem } from "@/components/layouts/app-layout";
import { LoadingRegion } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { getMeQueryOptions, useMe } from "@/features/auth/api/get-me";
import { useSignOut } from "@/features/auth/api/sign-out";
import type { AuthUserView as User } from "@shared/contracts";
import { HealthIndicator } from "@/features/health/components/health-indicator";
import type { AppOutletContext } from "@/app/routes/app/app-context";
import { designNavItems } from "@/app/routes/app/designs/routes";
import { runNavItems } from "@/app/routes/app/runs/routes";

/** Knows who is signed in before the frame renders, so there is no flash of the wrong page. */
export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getMeQueryOptions());
  return null;
};

/** Only the screens that work today; more join as they are built. */
function navItemsFor(user: User): NavItem[] {
  const items: NavItem[] = [{ name: "Overview", to: paths.app.overview.getHref(), end: true }, ...designNavItems(user), ...runNavItems(user)];
  if (hasAnyRole(user.roles, ACCESS.administer)) {
    items.push({ name: "Team", to: paths.app.team.getHref() });
    items.push({ name: "Outbox", to: paths.app.outbox.getHref() });
  }
  return items;
}

/** The signed-in frame. Without a session it sends the visitor to sign-in, remembering where to. */
export default function AppRoot() {
  const me = useMe();
  const location = useLocation();
  const signOut = useSignOut();

  if (me.isPending) return <LoadingRegion label="Checking your session…" />;
  if (me.isError) throw me.error;
  if (!me.data) {
    // After "Sign out" the next person starts at the Overview; after a lost session, where they were.
    const next = signOut.isIdle ? `${location.pathname}${location.search}` : null;
    return <Navigate to={paths.auth.signIn.getHref(next)} replace />;
  }

  const user = me.data;
  // Signing out empties the cached user, and the branch above then leads to sign-in.
  const handleSignOut = () => signOut.mutate();

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
