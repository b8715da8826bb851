import { ROLE_PURPOSE } from "@shared/roles";
import { formatDateTime } from "@/utils/format";
import type { InvitationPreview } from "@shared/contracts";

/** Who is invited, with which roles, until when. */
export function InvitationSummary({ invitation }: { invitation: InvitationPreview }) {
  return (
    <dl className="grid gap-3 rounded-md border border-ink-700 bg-ink-950/60 p-4 text-sm">
      <div>
        <dt className="text-xs uppercase tracking-wide text-ink-400">Invited e-mail</dt>
        <dd className="mt-0.5 font-mono text-paper-50">{invitation.email}</dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-ink-400">Roles</dt>
        <dd>
          <ul className="mt-1 flex flex-col gap-1">
            {invitation.roles.map((role) => (
              <li key={role}>
                <span className="font-mono text-signal-300">{role}</span>
                <span className="text-ink-300"> — {ROLE_PURPOSE[role]}</span>
              </li>
            ))}
          </ul>
        </dd>
      </div>
      <div>
        <dt className="text-xs uppercase tracking-wide text-ink-400">Link valid until</dt>
        <dd className="mt-0.5 font-mono text-paper-200">{formatDateTime(invitation.expiresAt)}</dd>
      </div>
    </dl>
  );
}
