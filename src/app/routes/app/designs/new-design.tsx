import { ACCESS, hasAnyRole } from "@shared/contracts";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { PageHeader } from "@/components/layouts/page-header";
import { NewDesignForm } from "@/features/designs/components/new-design-form";
import { useAppUser } from "@/app/routes/app/app-context";

export default function NewDesignRoute() {
  const user = useAppUser();
  if (!hasAnyRole(user.roles, ACCESS.editDesigns)) return <ForbiddenNotice screen="New design" role="designer" />;
  return (
    <>
      <title>New design · Lotwise</title>
      <PageHeader title="New design" lead="Start from a synthesized prototype, a blank netlist or a file. The first revision is r1; snap and assign grades in the workspace." />
      <NewDesignForm />
    </>
  );
}
