// Saws with their measured kerf, crosscut sleds with their five-cut checks. Every query is scoped by shop.
import { and, desc, eq, inArray } from "drizzle-orm";
import { kerfMeasurements, saws, sledChecks, sleds, users } from "../../db/schema";
import { getDb } from "~/db.server";
import { fiveCut, type FiveCutResult } from "~/lib/sled";

const HISTORY = 12;

export type SawSummary = { id: string; name: string; blade: string; latestKerfUm: number | null; latestAt: Date | null };
export type KerfRow = { id: string; sawId: string; kerfUm: number; note: string; measuredAt: Date; measuredBy: string | null };

export type SledCheck = {
  id: string;
  checkedAt: Date;
  checkedBy: string | null;
  widthFirstEndUm: number;
  widthSecondEndUm: number;
  stripLengthUm: number;
  pivotDistanceUm: number;
} & FiveCutResult;

export type SledSummary = { id: string; name: string; sawId: string | null; stopMinUm: number; stopMaxUm: number; widestUm: number; lastCheck: SledCheck | null };

function withMaths(row: Omit<SledCheck, keyof FiveCutResult>): SledCheck {
  return { ...row, ...fiveCut(row) };
}

/** Kerf measurements newest first, for the given saws. */
async function kerfRows(shopId: string, sawIds: string[]): Promise<KerfRow[]> {
  if (!sawIds.length) return [];
  return getDb()
    .select({ id: kerfMeasurements.id, sawId: kerfMeasurements.sawId, kerfUm: kerfMeasurements.kerfUm, note: kerfMeasurements.note, measuredAt: kerfMeasurements.measuredAt, measuredBy: users.name })
    .from(kerfMeasurements)
    .leftJoin(users, eq(users.id, kerfMeasurements.measuredBy))
    .where(and(eq(kerfMeasurements.shopId, shopId), inArray(kerfMeasurements.sawId, sawIds)))
    .orderBy(desc(kerfMeasurements.measuredAt), desc(kerfMeasurements.id));
}

async function checkRows(shopId: string, sledIds: string[]) {
  if (!sledIds.length) return [];
  const rows = await getDb()
    .select({
      id: sledChecks.id,
      sledId: sledChecks.sledId,
      checkedAt: sledChecks.checkedAt,
      checkedBy: users.name,
      widthFirstEndUm: sledChecks.widthFirstEndUm,
      widthSecondEndUm: sledChecks.widthSecondEndUm,
      stripLengthUm: sledChecks.stripLengthUm,
      pivotDistanceUm: sledChecks.pivotDistanceUm,
    })
    .from(sledChecks)
    .leftJoin(users, eq(users.id, sledChecks.checkedBy))
    .where(and(eq(sledChecks.shopId, shopId), inArray(sledChecks.sledId, sledIds)))
    .orderBy(desc(sledChecks.checkedAt), desc(sledChecks.id));
  return rows.map(({ sledId, ...row }) => ({ sledId, ...withMaths(row) }));
}

/** asOf: the latest measurement up to that moment (a cut batch's set-up sheet shows the saw as it was). */
export async function listSaws(shopId: string, asOf?: Date): Promise<SawSummary[]> {
  const rows = await getDb().select({ id: saws.id, name: saws.name, blade: saws.blade }).from(saws).where(eq(saws.shopId, shopId)).orderBy(saws.name, saws.id);
  const kerfs = await kerfRows(shopId, rows.map((r) => r.id));
  return rows.map((saw) => {
    const latest = kerfs.find((k) => k.sawId === saw.id && (!asOf || k.measuredAt <= asOf));
    return { ...saw, latestKerfUm: latest?.kerfUm ?? null, latestAt: latest?.measuredAt ?? null };
  });
}

/** asOf: the last check up to that moment (a cut batch's set-up sheet shows the sled as it was). */
export async function listSleds(shopId: string, asOf?: Date): Promise<SledSummary[]> {
  const rows = await getDb()
    .select({ id: sleds.id, name: sleds.name, sawId: sleds.sawId, stopMinUm: sleds.stopMinUm, stopMaxUm: sleds.stopMaxUm, widestUm: sleds.widestUm })
    .from(sleds)
    .where(eq(sleds.shopId, shopId))
    .orderBy(sleds.name, sleds.id);
  const checks = await checkRows(shopId, rows.map((r) => r.id));
  return rows.map((sled) => {
    const last = checks.find((c) => c.sledId === sled.id && (!asOf || c.checkedAt <= asOf));
    return { ...sled, lastCheck: last ? stripSled(last) : null };
  });
}

function stripSled<T extends { sledId: string }>({ sledId: _, ...rest }: T) {
  return rest;
}

/** Everything the sleds page shows: saws with their kerf history, sleds with their check history. */
export async function sawStation(shopId: string) {
  const [sawList, sledList] = await Promise.all([listSaws(shopId), listSleds(shopId)]);
  const [kerfs, checks] = await Promise.all([kerfRows(shopId, sawList.map((s) => s.id)), checkRows(shopId, sledList.map((s) => s.id))]);
  return {
    saws: sawList.map((saw) => ({ ...saw, history: kerfs.filter((k) => k.sawId === saw.id).slice(0, HISTORY) })),
    sleds: sledList.map((sled) => ({ ...sled, history: checks.filter((c) => c.sledId === sled.id).slice(0, HISTORY).map(stripSled) })),
  };
}

export async function getSaw(shopId: string, sawId: string, asOf?: Date) {
  return (await listSaws(shopId, asOf)).find((s) => s.id === sawId) ?? null;
}

export async function getSled(shopId: string, sledId: string, asOf?: Date) {
  return (await listSleds(shopId, asOf)).find((s) => s.id === sledId) ?? null;
}

export async function addSaw(shopId: string, input: { name: string; blade: string }): Promise<string> {
  const [row] = await getDb().insert(saws).values({ shopId, ...input }).returning({ id: saws.id });
  return row.id;
}

async function sawInShop(shopId: string, sawId: string): Promise<boolean> {
  const [row] = await getDb().select({ id: saws.id }).from(saws).where(and(eq(saws.id, sawId), eq(saws.shopId, shopId)));
  return Boolean(row);
}

/** False: no such saw in this shop. */
export async function recordKerf(shopId: string, sawId: string, userId: string, input: { kerfUm: number; note: string }, measuredAt = new Date()): Promise<boolean> {
  if (!(await sawInShop(shopId, sawId))) return false;
  await getDb().insert(kerfMeasurements).values({ shopId, sawId, measuredBy: userId, measuredAt, ...input });
  return true;
}

/** Null: the named saw is not in this shop. */
export async function addSled(shopId: string, input: { name: string; sawId: string | null; stopMinUm: number; stopMaxUm: number; widestUm: number }): Promise<string | null> {
  if (input.sawId && !(await sawInShop(shopId, input.sawId))) return null;
  const [row] = await getDb().insert(sleds).values({ shopId, ...input }).returning({ id: sleds.id });
  return row.id;
}

/** False: no such sled in this shop. */
export async function recordSledCheck(
  shopId: string,
  sledId: string,
  userId: string,
  input: { widthFirstEndUm: number; widthSecondEndUm: number; stripLengthUm: number; pivotDistanceUm: number },
  checkedAt = new Date(),
): Promise<boolean> {
  const [sled] = await getDb().select({ id: sleds.id }).from(sleds).where(and(eq(sleds.id, sledId), eq(sleds.shopId, shopId)));
  if (!sled) return false;
  await getDb().insert(sledChecks).values({ shopId, sledId, checkedBy: userId, checkedAt, ...input });
  return true;
}
