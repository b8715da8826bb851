import { formatSi } from "@shared/units";
import { Button } from "@/components/ui/button";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { useDeleteGrade } from "@/features/grades/api/save-grade";
import { useGrades } from "@/features/grades/api/get-grades";
import type { Grade } from "@shared/contracts";

const UNIT = { R: "Ω", L: "H", C: "F" } as const;

function tolerance(g: Grade): string {
  if (g.toleranceAbs !== null) return `± ${formatSi(g.toleranceAbs, UNIT[g.kind])}`;
  if (g.tolerance !== null) return `± ${Number((g.tolerance * 100).toPrecision(6))} %`;
  return "—";
}

/** The grade catalogue: kind, code, label, tolerance, distribution, cost each; planners edit. */
export function GradesTable({ canEdit, onEdit }: { canEdit: boolean; onEdit: (grade: Grade) => void }) {
  const { data: grades } = useGrades();
  const remove = useDeleteGrade();
  if (!grades.length) return <p className="py-4 text-sm text-ink-300">No grades yet.</p>;
  return (
    <Table>
      <TableCaption>Grades</TableCaption>
      <TableHead>
        <TableRow>
          <TableHeaderCell>Kind</TableHeaderCell>
          <TableHeaderCell>Code</TableHeaderCell>
          <TableHeaderCell>Label</TableHeaderCell>
          <TableHeaderCell>Tolerance</TableHeaderCell>
          <TableHeaderCell>Distribution</TableHeaderCell>
          <TableHeaderCell className="text-right">Cost each</TableHeaderCell>
          {canEdit && <TableHeaderCell className="text-right">Change</TableHeaderCell>}
        </TableRow>
      </TableHead>
      <TableBody>
        {grades.map((g) => (
          <TableRow key={g.id}>
            <TableCell className="font-mono">{g.kind}</TableCell>
            <TableCell className="font-mono">{g.code}</TableCell>
            <TableCell>{g.label}</TableCell>
            <TableCell className="font-mono">{tolerance(g)}</TableCell>
            <TableCell>{g.distribution}</TableCell>
            <TableCell className="text-right font-mono">{g.costEach.toFixed(3)}</TableCell>
            {canEdit && (
              <TableCell className="text-right whitespace-nowrap">
                <Button size="sm" variant="ghost" aria-label={`Edit ${g.kind} ${g.code}`} onClick={() => onEdit(g)}>
                  Edit
                </Button>
                <Button size="sm" variant="ghost" aria-label={`Delete ${g.kind} ${g.code}`} pending={remove.isPending && remove.variables === g.id} onClick={() => remove.mutate(g.id)}>
                  Delete
                </Button>
              </TableCell>
            )}
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}
