import { batchCode } from "~/lib/batches";
import { todayIso } from "~/lib/dates";
import { parsePeriod, summarise } from "~/lib/ledger-report";
import { ledgerBatches, monthlyTrend } from "./ledger.server";

/** Everything the ledger page, its API route and its CSV show for a period. */
export async function ledgerReport(shopId: string, params: URLSearchParams) {
  const period = parsePeriod(params, todayIso());
  const [rows, trend] = await Promise.all([ledgerBatches(shopId, period.from, period.to), monthlyTrend(shopId)]);
  const batches = rows.map((r) => ({ ...r, batchCode: batchCode(r.batchNumber), cutAt: r.cutAt.toISOString() }));
  return { period, batches, summary: summarise(rows), trend };
}
