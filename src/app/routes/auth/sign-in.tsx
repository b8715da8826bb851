import { Navigate, useSearchParams } from "react-router-dom";
import { AuthLayout } from "@/components/layouts/auth-layout";
import { paths, safeNextHref } from "@/config/paths";
import { useMe } from "@/features/auth/api/get-me";
import { SignInForm } from "@/features/auth/components/sign-in-form";

/** Sign-in. Once someone is signed in (now or already), they go on to `?next=` or the Overview. */
export default function SignInRoute() {
  const [params] = useSearchParams();
  const next = safeNextHref(params.get("next"));
  const me = useMe();

  if (me.data) return <Navigate to={next === paths.auth.signIn.path ? "/" : next} replace />;

  return (
    <AuthLayout title="Sign in to Lotwise" lead="Use the e-mail address your team invited.">
      <title>Sign in · Lotwise</title>
      {/* Success updates the cached user; the redirect above then takes over. */}
      <SignInForm />
    </AuthLayout>
  );
}
