import { Alert } from "@/components/ui/alert";

/** Shown instead of a screen the signed-in person's roles do not open. */
export function ForbiddenNotice({ screen, role }: { screen: string; role: string }) {
  return (
    <Alert tone="info" title={`${screen} needs the ${role} role`}>
      Ask an admin of your team to add the role to your account if you need this screen.
    </Alert>
  );
}
