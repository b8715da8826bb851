import {
  Table,
  TableBody,
  TableCaption,
  TableHead,
  TableHeaderCell,
  TableRow,
} from "@/components/ui/table";
import { useMembers } from "@/features/team/api/get-members";
import { MemberRow } from "@/features/team/components/member-row";

/** Everyone with an account: active first, then by name. */
export function MembersTable({ currentUserId }: { currentUserId: string }) {
  const { data: members } = useMembers();
  const sorted = [...members].sort(
    (a, b) => Number(b.active) - Number(a.active) || a.name.localeCompare(b.name),
  );

  return (
    <Table>
      <TableCaption>Team members</TableCaption>
      <TableHead>
        <TableRow>
          <TableHeaderCell>Person</TableHeaderCell>
          <TableHeaderCell>Roles (press to switch)</TableHeaderCell>
          <TableHeaderCell>State</TableHeaderCell>
          <TableHeaderCell>Joined</TableHeaderCell>
          <TableHeaderCell className="text-right">Access</TableHeaderCell>
        </TableRow>
      </TableHead>
      <TableBody>
        {sorted.map((member) => (
          <MemberRow key={member.id} member={member} isSelf={member.id === currentUserId} />
        ))}
      </TableBody>
    </Table>
  );
}
