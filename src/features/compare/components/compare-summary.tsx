import { Link } from "react-router-dom";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { paths } from "@/config/paths";
import type { CompareEntry } from "@/features/compare/api/get-compare";
import { count, interval, money, percent, ruleName } from "@/features/runs";

/** Runs as columns: yield ± interval, trials, BOM cost, then failing trials per rule (rules matched by position). */
export function CompareSummary({ entries, colors }: { entries: CompareEntry[]; colors: readonly string[] }) {
  const ruleSource = entries.find((e) => e.result)?.result?.rules ?? [];
  const best = Math.max(...entries.map((e) => e.result?.yield ?? -1));
  return (
    <Table>
      <TableCaption>Runs side by side</TableCaption>
      <TableHead>
        <tr>
          <TableHeaderCell>&nbsp;</TableHeaderCell>
          {entries.map(({ run }, k) => (
            <TableHeaderCell key={run.id} className="normal-case">
              <span className="mr-1.5 inline-block size-2.5 rounded-full" style={{ background: colors[k % colors.length] }} aria-hidden="true" />
              <Link className="text-signal-300 underline" to={paths.app.run.getHref(run.id)}>{run.designName} r{run.revisionNumber}</Link>
              <span className="block font-normal text-ink-300">{run.label || run.id.slice(0, 8)}</span>
            </TableHeaderCell>
          ))}
        </tr>
      </TableHead>
      <TableBody>
        <Row name="yield" cells={entries.map((e) => <span key={e.run.id} className={e.result?.yield === best ? "text-2xl font-bold text-pass-300" : "text-2xl"}>{percent(e.result?.yield)}</span>)} />
        <Row name="95 % interval" cells={entries.map((e) => interval(e.result?.wilson95))} />
        <Row name="trials" cells={entries.map((e) => count(e.result?.trials))} />
        <Row name="seed" cells={entries.map((e) => String(e.run.seed))} />
        <Row name="BOM cost" cells={entries.map((e) => money(e.run.bomCost))} />
        <Row name="cost per good unit" cells={entries.map((e) => (e.run.bomCost !== null && e.result?.yield ? money(e.run.bomCost / e.result.yield) : "—"))} />
        {ruleSource.map((rule, r) => (
          <Row key={rule.index} name={`fails: ${ruleName(rule)}`} cells={entries.map((e) => count(e.result?.rules[r]?.failures))} />
        ))}
      </TableBody>
    </Table>
  );
}

function Row({ name, cells }: { name: string; cells: React.ReactNode[] }) {
  return (
    <TableRow>
      <TableCell className="text-ink-300">{name}</TableCell>
      {cells.map((c, k) => <TableCell key={k} className="font-mono">{c}</TableCell>)}
    </TableRow>
  );
}
