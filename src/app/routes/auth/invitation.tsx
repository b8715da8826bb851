import { useNavigate, useParams } from "react-router-dom";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextLink } from "@/components/ui/link";
import { LoadingRegion } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { ApiError } from "@/lib/api-client";
import { useInvitation } from "@/features/auth/api/get-invitation";
import { AcceptInvitationForm } from "@/features/auth/components/accept-invitation-form";
import { InvitationSummary } from "@/features/auth/components/invitation-summary";

/** Accepting an invitation: shows what was offered, creates the account, lands signed in. */
export default function InvitationRoute() {
  const { token = "" } = useParams();
  const navigate = useNavigate();
  const invitation = useInvitation(token);

  return (
    <AuthLayout title="Join your team on Lotwise" lead="Choose the name your team will see and a password.">
      <title>Invitation · Lotwise</title>
      {invitation.isPending && <LoadingRegion label="Reading the invitation…" />}
      {invitation.isError && <InvitationProblem error={invitation.error} onRetry={() => invitation.refetch()} />}
      {invitation.isSuccess && (
        <div className="flex flex-col gap-6">
          <InvitationSummary invitation={invitation.data} />
          <AcceptInvitationForm
            token={token}
            onSuccess={() => navigate(paths.app.root.getHref(), { replace: true })}
          />
        </div>
      )}
    </AuthLayout>
  );
}

function InvitationProblem({ error, onRetry }: { error: Error; onRetry: () => void }) {
  if (error instanceof ApiError && (error.status === 404 || error.code === "TOKEN_INVALID")) {
    return (
      <Alert tone="error" title="This invitation cannot be used">
        It may have been accepted already, revoked, or have expired. Ask an admin of your team for a
        new one. Already have an account? <TextLink to={paths.auth.signIn.getHref()}>Sign in</TextLink>
      </Alert>
    );
  }
  return (
    <Alert tone="error" title="The invitation could not be read">
      <p>{error.message}</p>
      <Button variant="secondary" size="sm" className="mt-3" onClick={onRetry}>
        Try again
      </Button>
    </Alert>
  );
}
