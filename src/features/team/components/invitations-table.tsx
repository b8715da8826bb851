import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import {
  Table,
  TableBody,
  TableCaption,
  TableCell,
  TableHead,
  TableHeaderCell,
  TableRow,
} from "@/components/ui/table";
import { splitApiError } from "@/lib/form";
import { formatDateTime, isPast } from "@/utils/format";
import { useInvitations } from "@/features/team/api/get-invitations";
import { useRevokeInvitation } from "@/features/team/api/revoke-invitation";
import type { Invitation } from "@shared/contracts";

type State = "pending" | "accepted" | "revoked" | "expired";

function stateOf(invitation: Invitation): State {
  if (invitation.acceptedAt) return "accepted";
  if (invitation.revokedAt) return "revoked";
  return isPast(invitation.expiresAt) ? "expired" : "pending";
}

const TONE = { pending: "signal", accepted: "pass", revoked: "muted", expired: "muted" } as const;

/** Invitations sent so far, newest first; pending ones can be revoked. */
export function InvitationsTable() {
  const { data: invitations } = useInvitations();
  const revoke = useRevokeInvitation();
  const sorted = [...invitations].sort((a, b) => b.createdAt.localeCompare(a.createdAt));

  if (sorted.length === 0) {
    return <p className="text-sm text-ink-300">No invitations yet. Use the form to invite someone.</p>;
  }

  return (
    <div className="flex flex-col gap-3">
      {revoke.isError && (
        <p role="alert" className="text-xs font-semibold text-fault-300">
          {splitApiError(revoke.error).message}
        </p>
      )}
      <Table>
        <TableCaption>Invitations</TableCaption>
        <TableHead>
          <TableRow>
            <TableHeaderCell>Invited</TableHeaderCell>
            <TableHeaderCell>Roles</TableHeaderCell>
            <TableHeaderCell>State</TableHeaderCell>
            <TableHeaderCell>Sent</TableHeaderCell>
            <TableHeaderCell>Valid until</TableHeaderCell>
            <TableHeaderCell className="text-right">Link</TableHeaderCell>
          </TableRow>
        </TableHead>
        <TableBody>
          {sorted.map((invitation) => {
            const state = stateOf(invitation);
            const revoking = revoke.isPending && revoke.variables === invitation.id;
            return (
              <TableRow key={invitation.id}>
                <TableCell>
                  <div className="font-mono text-paper-50">{invitation.email}</div>
                  <div className="text-xs text-ink-300">by {invitation.invitedBy}</div>
                </TableCell>
                <TableCell className="font-mono text-xs text-paper-200">{invitation.roles.join(", ")}</TableCell>
                <TableCell>
                  <Badge tone={TONE[state]}>{state}</Badge>
                </TableCell>
                <TableCell className="whitespace-nowrap font-mono text-xs text-ink-300">{formatDateTime(invitation.createdAt)}</TableCell>
                <TableCell className="whitespace-nowrap font-mono text-xs text-ink-300">{formatDateTime(invitation.expiresAt)}</TableCell>
                <TableCell className="text-right">
                  {state === "pending" && (
                    <Button size="sm" variant="danger" pending={revoking} onClick={() => revoke.mutate(invitation.id)}>
                      Revoke<span className="sr-only"> invitation for {invitation.email}</span>
                    </Button>
                  )}
                </TableCell>
              </TableRow>
            );
          })}
        </TableBody>
      </Table>
    </div>
  );
}
