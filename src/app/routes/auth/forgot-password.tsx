import { AuthLayout } from "@/components/layouts/auth-layout";
import { TextLink } from "@/components/ui/link";
import { paths } from "@/config/paths";
import { ForgotPasswordForm } from "@/features/auth/components/forgot-password-form";

export default function ForgotPasswordRoute() {
  return (
    <AuthLayout title="Reset your password" lead="We will mail a link to set a new one.">
      <title>Reset password · Lotwise</title>
      <ForgotPasswordForm />
      <p className="mt-6 text-sm text-ink-300">
        Remembered it? <TextLink to={paths.auth.signIn.getHref()}>Back to sign-in</TextLink>
      </p>
    </AuthLayout>
  );
}
