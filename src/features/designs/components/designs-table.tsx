import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { TextLink } from "@/components/ui/link";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { paths } from "@/config/paths";
import { useDesigns } from "@/features/designs/api/get-designs";
import { useUpdateDesign } from "@/features/designs/api/update-design";
import { DEFAULT_STRESS_CLASS, type DesignView as Design } from "@shared/contracts";
import { formatDateTime } from "@/utils/format";

function pct(v: number): string {
  return `${(v * 100).toFixed(1)} %`;
}

/** Every design: latest revision and its review state, owner, latest yield (95 % interval), last change. */
export function DesignsTable({ archived, canArchive }: { archived: boolean; canArchive: boolean }) {
  const { data: designs } = useDesigns(archived);
  const update = useUpdateDesign();
  if (designs.length === 0) {
    return <p className="py-4 text-sm text-ink-300">{archived ? "No archived designs." : "No designs yet."}</p>;
  }
  return (
    <Table>
      <TableCaption>Designs</TableCaption>
      <TableHead>
        <TableRow>
          <TableHeaderCell>Design</TableHeaderCell>
          <TableHeaderCell>Latest revision</TableHeaderCell>
          <TableHeaderCell>Owner</TableHeaderCell>
          <TableHeaderCell>Latest yield</TableHeaderCell>
          <TableHeaderCell>Updated</TableHeaderCell>
          {canArchive && <TableHeaderCell className="text-right">Archive</TableHeaderCell>}
        </TableRow>
      </TableHead>
      <TableBody>
        {designs.map((d: Design) => (
          <TableRow key={d.id}>
            <TableCell>
              <TextLink to={paths.app.design.getHref(d.id)}>{d.name}</TextLink>
              {d.stress !== DEFAULT_STRESS_CLASS && <Badge tone="fault" className="ml-2">{d.stress}</Badge>}
              {d.description && <p className="mt-0.5 max-w-md truncate text-xs text-ink-300">{d.description}</p>}
            </TableCell>
            <TableCell className="font-mono">
              {d.latestRevision ? (
                <span className="flex items-center gap-2">
                  r{d.latestRevision.number} <Badge tone="muted">{d.latestRevision.reviewState}</Badge>
                </span>
              ) : (
                "—"
              )}
            </TableCell>
            <TableCell>{d.owner.name}</TableCell>
            <TableCell className="font-mono">
              {d.latestYield ? (
                <span title={`95 % interval ${pct(d.latestYield.wilson95[0])} – ${pct(d.latestYield.wilson95[1])}`}>
                  {pct(d.latestYield.yield)}{" "}
                  <span className="text-xs text-ink-400">
                    [{pct(d.latestYield.wilson95[0])}, {pct(d.latestYield.wilson95[1])}]
                  </span>
                </span>
              ) : (
                <span className="text-ink-400">no run</span>
              )}
            </TableCell>
            <TableCell className="text-xs text-ink-300">{formatDateTime(d.updatedAt)}</TableCell>
            {canArchive && (
              <TableCell className="text-right">
                <Button size="sm" variant="ghost" pending={update.isPending && update.variables?.id === d.id} onClick={() => update.mutate({ id: d.id, data: { archived: !archived } })}>
                  {archived ? "Restore" : "Archive"}
                </Button>
              </TableCell>
            )}
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}
