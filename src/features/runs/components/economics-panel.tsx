import { Card } from "@/components/ui/card";
import type { RunEconomics as Economics } from "@shared/contracts";
import { count, money } from "@/features/runs/utils/format";

/**
 * The lot in money: expected good = lot × yield, scrap = lot − good, scrap cost = scrap × BOM cost,
 * cost per good unit = BOM cost / yield (figures from the server, in the grade catalogue's currency).
 */
export function EconomicsPanel({ economics }: { economics: Economics | null }) {
  return (
    <Card title="The lot" description="BOM cost is the sum of each part's grade cost; parts without a grade cost nothing.">
      {economics ? (
        <dl className="grid grid-cols-2 gap-4 font-mono sm:grid-cols-3">
          <Fact term="lot size" value={count(economics.lotSize)} />
          <Fact term="expected good" value={count(economics.expectedGood)} tone="text-pass-300" />
          <Fact term="scrap units" value={count(economics.scrapUnits)} tone="text-fault-300" />
          <Fact term="BOM cost / unit" value={money(economics.bomCost)} />
          <Fact term="scrap cost" value={money(economics.scrapCost)} tone="text-fault-300" />
          <Fact term="cost per good unit" value={money(economics.costPerGoodUnit)} tone="text-signal-300" />
        </dl>
      ) : (
        <p className="text-sm text-ink-300">No cost figures for this run.</p>
      )}
    </Card>
  );
}

function Fact({ term, value, tone = "text-paper-50" }: { term: string; value: string; tone?: string }) {
  return (
    <div>
      <dt className="font-sans text-xs uppercase tracking-wide text-ink-300">{term}</dt>
      <dd className={`text-xl ${tone}`}>{value}</dd>
    </div>
  );
}
