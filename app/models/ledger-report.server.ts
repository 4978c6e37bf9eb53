import { batchCode } from "~/lib/batches";
import { todayIso } from "~/lib/dates";
import { getShop } from "./shops.server";
import { parsePeriod, summarise } from "~/lib/ledger-report";
import { ledgerBatches, monthlyTrend } from "./ledger.server";

/** Everything the ledger page, its API route and its CSV show for a period. */
export async function ledgerReport(shopId: string, params: URLSearchParams) {
  const { timeZone } = await getShop(shopId);
  const now = new Date();
  const period = parsePeriod(params, todayIso(now, timeZone));
  const [rows, trend] = await Promise.all([ledgerBatches(shopId, period.from, period.to, timeZone), monthlyTrend(shopId, now, 12, timeZone)]);
  // cutDay: the day it was cut on the shop's clock, as the page and the CSV give it
  const batches = rows.map((r) => ({ ...r, batchCode: batchCode(r.batchNumber), cutAt: r.cutAt.toISOString(), cutDay: todayIso(r.cutAt, timeZone) }));
  return { period, batches, summary: summarise(rows), trend };
}
