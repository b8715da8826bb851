import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { AboutLotwise } from "@/features/overview/components/about-lotwise";
import { RoleSummary } from "@/features/overview/components/role-summary";
import { SafetyNote } from "@/features/overview/components/safety-note";
import { useAppUser } from "@/app/routes/app/app-context";

/** The home page: who you are here, what Lotwise is for, and what it cannot promise. */
export default function OverviewRoute() {
  const user = useAppUser();
  const firstName = user.name.split(/\s+/)[0] || user.name;

  return (
    <>
      <title>Overview · Lotwise</title>
      <PageHeader
        title={`Welcome, ${firstName}`}
        lead="Estimate how many built filters will pass their acceptance test before a single part is ordered."
      />
      <div className="flex flex-col gap-6">
        <RegionBoundary region="Your roles">
          <RoleSummary roles={user.roles} />
        </RegionBoundary>
        <RegionBoundary region="About Lotwise">
          <AboutLotwise />
        </RegionBoundary>
        <RegionBoundary region="Safety note">
          <SafetyNote />
        </RegionBoundary>
      </div>
    </>
  );
}
