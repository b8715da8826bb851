import { useParams } from "react-router-dom";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { ResetPasswordForm } from "@/features/auth/components/reset-password-form";

export default function ResetPasswordRoute() {
  const { token = "" } = useParams();
  return (
    <AuthLayout title="Choose a new password" lead="Other sessions of this account stay signed in until they expire or sign out.">
      <title>New password · Lotwise</title>
      <ResetPasswordForm token={token} />
    </AuthLayout>
  );
}
