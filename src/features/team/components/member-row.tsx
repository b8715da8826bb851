import { useState } from "react";
import { ROLES, ROLE_PURPOSE, type Role } from "@shared/roles";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { TableCell, TableRow } from "@/components/ui/table";
import { phraseFieldError, splitApiError, validateWith } from "@/lib/form";
import { cn } from "@/utils/cn";
import { formatDate } from "@/utils/format";
import { updateMemberSchema, useUpdateMember } from "@/features/team/api/update-member";
import type { Member } from "@shared/contracts";

const COLUMNS = 5;

/** One person: role toggles and activate/deactivate, with the server's refusal shown under the row. */
export function MemberRow({ member, isSelf }: { member: Member; isSelf: boolean }) {
  const update = useUpdateMember();
  const [problem, setProblem] = useState<string | null>(null);

  function send(data: { roles?: Role[]; active?: boolean }) {
    const parsed = validateWith(updateMemberSchema, data);
    if (!parsed.ok) {
      setProblem(phraseFieldError("A member", parsed.errors.roles ?? Object.values(parsed.errors)[0]) ?? null);
      return;
    }
    setProblem(null);
    update.mutate(
      { id: member.id, data: parsed.data },
      { onError: (error) => setProblem(splitApiError(error).message ?? "The change was refused.") },
    );
  }

  function handleToggleRole(role: Role) {
    const roles = member.roles.includes(role) ? member.roles.filter((r) => r !== role) : [...member.roles, role];
    send({ roles: ROLES.filter((r) => roles.includes(r)) });
  }

  return (
    <>
      <TableRow className={cn(!member.active && "opacity-60")} aria-busy={update.isPending || undefined}>
        <TableCell>
          <span className="font-semibold text-paper-50">{member.name}</span>
          {isSelf && <Badge className="ml-2" tone="muted">you</Badge>}
          <div className="font-mono text-xs text-ink-300">{member.email}</div>
        </TableCell>
        <TableCell>
          <div role="group" aria-label={`Roles of ${member.name}`} className="flex flex-wrap gap-1">
            {ROLES.map((role) => {
              const held = member.roles.includes(role);
              return (
                <button
                  key={role}
                  type="button"
                  aria-pressed={held}
                  title={ROLE_PURPOSE[role]}
                  disabled={update.isPending}
                  onClick={() => handleToggleRole(role)}
                  className={cn(
                    "rounded border px-2 py-1 font-mono text-xs transition-colors disabled:cursor-wait",
                    "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-signal-300",
                    held
                      ? "border-signal-500 bg-signal-500/15 text-signal-200"
                      : "border-ink-600 text-ink-400 hover:border-ink-500 hover:text-paper-200",
                  )}
                >
                  <span className="sr-only">{member.name}: </span>
                  {role}
                </button>
              );
            })}
          </div>
        </TableCell>
        <TableCell>
          <Badge tone={member.active ? "pass" : "muted"}>{member.active ? "active" : "inactive"}</Badge>
        </TableCell>
        <TableCell className="whitespace-nowrap font-mono text-xs text-ink-300">{formatDate(member.createdAt)}</TableCell>
        <TableCell className="text-right">
          <Button
            size="sm"
            variant={member.active ? "danger" : "secondary"}
            pending={update.isPending}
            onClick={() => send({ active: !member.active })}
          >
            {member.active ? "Deactivate" : "Activate"}
            <span className="sr-only"> {member.name}</span>
          </Button>
        </TableCell>
      </TableRow>
      {problem && (
        <tr>
          <td colSpan={COLUMNS} className="px-3 pb-3">
            <p role="alert" className="text-xs font-semibold text-fault-300">
              {member.name}: {problem}
            </p>
          </td>
        </tr>
      )}
    </>
  );
}
