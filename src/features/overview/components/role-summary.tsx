import { ROLE_PURPOSE, type Role } from "@shared/roles";
import { Card } from "@/components/ui/card";

/** The person's roles and what each lets them do. */
export function RoleSummary({ roles }: { roles: readonly Role[] }) {
  return (
    <Card title="Your roles" description="What you can do in Lotwise. One person may hold several roles.">
      <ul className="grid gap-3 sm:grid-cols-2">
        {roles.map((role) => (
          <li key={role} className="rounded-md border border-ink-700 bg-ink-950/60 px-4 py-3">
            <p className="font-mono text-sm font-bold text-signal-300">{role}</p>
            <p className="mt-1 text-sm text-paper-200">{ROLE_PURPOSE[role]}</p>
          </li>
        ))}
      </ul>
    </Card>
  );
}
