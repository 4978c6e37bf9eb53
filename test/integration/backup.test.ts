// bin/backup and bin/restore round-trip the demo data: same rows, same checksum, table by table.
import { execFileSync } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { eq } from "drizzle-orm";
import postgres from "postgres";
import { describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { seedDemo, seedDemoHistory } from "../../db/seed";
import { getDb } from "~/db.server";

const bin = (name: string) => fileURLToPath(new URL(`../../bin/${name}`, import.meta.url));

async function tableChecksums(url: string) {
  const sql = postgres(url, { max: 1, fetch_types: false, onnotice: () => {} });
  try {
    const tables = await sql<{ name: string }[]>`select table_name as name from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`;
    const out: Record<string, { rows: number; md5: string }> = {};
    for (const { name } of tables) {
      const [row] = await sql.unsafe(`select count(*)::int as rows, md5(coalesce(string_agg(t::text, '|' order by t::text), '')) as md5 from "${name}" t`);
      out[name] = { rows: row.rows, md5: row.md5 };
    }
    return out;
  } finally {
    await sql.end();
  }
}

describe("backups", () => {
  it("a backup restored into a fresh database holds the same rows in every table", async () => {
    const db = getDb();
    let [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    if (!demo) {
      await seedDemo(db);
      [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    }
    if ((await db.select().from(t.batchCosts).where(eq(t.batchCosts.shopId, demo.id))).length === 0) await seedDemoHistory(db);
    const file = join(mkdtempSync(join(tmpdir(), "stopwise-backup-")), "test.dump");
    const name = `restored_${Date.now()}`;
    execFileSync(bin("backup"), [file], { env: process.env, stdio: "pipe" });
    execFileSync(bin("restore"), [file, name], { env: process.env, stdio: "pipe" });
    const source = await tableChecksums(process.env.DATABASE_URL!);
    const restored = await tableChecksums(process.env.DATABASE_URL!.replace(/\/[^/]+$/, `/${name}`));
    expect(source.orders.rows).toBeGreaterThan(0);
    expect(source.batch_costs.rows).toBeGreaterThan(0);
    expect(restored).toEqual(source);
    // It never restores over an existing database.
    expect(() => execFileSync(bin("restore"), [file, name], { env: process.env, stdio: "pipe" })).toThrow(/exists already/);
  });
});
