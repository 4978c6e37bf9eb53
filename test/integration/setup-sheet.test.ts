import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { seedDemo } from "../../db/seed";
import { appServer } from "../support/app";
import { batchScenario } from "../support/batch-factories";
import { signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { sheetLength } from "~/lib/setup-sheet";
import type { PlanResult } from "~/models/plans.server";
import { createBatches } from "~/models/batches.server";
import { releasePlan, requestPlan } from "~/models/plans.server";
import { addSaw, addSled, recordKerf, recordSledCheck } from "~/models/sleds.server";

const server = await appServer();
const db = getDb();
const work = mkdtempSync(join(tmpdir(), "setup-sheet-"));
const settings = (over: Partial<t.PlanSettings> = {}): t.PlanSettings => ({ kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 400, offcutIds: [], seed: 7, ...over });

beforeAll(async () => {
  await startPlanRunner();
});
afterAll(async () => {
  await stopPlanRunner();
});

async function waitForPlan(planId: string) {
  const deadline = Date.now() + 20_000;
  for (;;) {
    const [row] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
    if (row.status === "done") return row;
    if (row.status === "failed" || Date.now() > deadline) throw new Error(`plan ${row.status}: ${row.error}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Plans and releases the shop's batch of a material; returns the batch and the released plan's result. */
async function release(shopId: string, batchId: string, over: Partial<t.PlanSettings> = {}) {
  const planId = await requestPlan(shopId, batchId, settings(over));
  const plan = await waitForPlan(planId);
  await releasePlan(shopId, batchId, planId);
  return plan.result as PlanResult;
}

function pdfOf(res: request.Response, name: string): string {
  const file = join(work, `${name}.pdf`);
  writeFileSync(file, res.body as Buffer);
  return file;
}
const binary = (res: NodeJS.ReadableStream & { setEncoding(e: string): void }, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  res.on("data", (c: Buffer) => chunks.push(Buffer.from(c)));
  res.on("end", () => done(null, Buffer.concat(chunks)));
};
/** Every pixel of every page at 60 dpi, from pdftoppm's plain PPM (P6: a text header, then RGB bytes). */
function rasterPixels(file: string): [number, number, number][] {
  const prefix = join(work, "raster");
  execFileSync("pdftoppm", ["-r", "60", file, prefix]);
  const pixels: [number, number, number][] = [];
  for (const page of readdirSync(work).filter((f) => f.startsWith("raster") && f.endsWith(".ppm"))) {
    const data = readFileSync(join(work, page));
    const header = /^P6\s+(\d+)\s+(\d+)\s+255\s/.exec(data.subarray(0, 40).toString("latin1"))!;
    for (let i = header[0].length; i + 2 < data.length; i += 3) pixels.push([data[i], data[i + 1], data[i + 2]]);
  }
  return pixels;
}
const text = (file: string) => execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
const flat = (s: string) => s.replace(/\s+/g, " ");
const get = (path: string, cookie: string) => request(server).get(path).set("Cookie", cookie).buffer(true).parse(binary as never);

describe("the set-up sheet of a released batch", () => {
  let s: Awaited<ReturnType<typeof batchScenario>>;
  let six: string;
  let three: string;
  let result: PlanResult;
  let sawyer: string;

  beforeAll(async () => {
    s = await batchScenario();
    // Names that need more than Latin-1 (TTF fonts, not the web font's subsets).
    const lines = await db.select().from(t.orderLines).where(eq(t.orderLines.orderId, s.wedding.id));
    const numbers = lines.find((l) => l.personalisation[0] === "Table 1")!;
    await db.update(t.orderLines).set({ personalisation: ["Zoë", "Nguyễn Thảo", "Table 3"] }).where(eq(t.orderLines.id, numbers.id));
    await createBatches(s.shop.id, "2027-01-15");
    const rows = await db.select().from(t.batches).where(eq(t.batches.shopId, s.shop.id));
    six = rows.find((b) => b.materialId === s.birch6.id)!.id;
    three = rows.find((b) => b.materialId === s.birch3.id)!.id;
    result = await release(s.shop.id, six); // no saw, no sled chosen
    sawyer = await signIn(server, s.shop.users.sawyer);
  });

  it("lists exactly the plan's set-ups with their counts, in cutting order", async () => {
    const res = await get(`/batches/${six}/setup-sheet?paper=a4`, sawyer);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    const [batch] = await db.select().from(t.batches).where(eq(t.batches.id, six));
    const code = `B-${String(batch.number).padStart(4, "0")}`;
    expect(res.headers["content-disposition"]).toBe(`inline; filename="${code}-setup-sheet.pdf"`);
    const out = text(pdfOf(res, "a4"));
    const listed = [...out.matchAll(/^\s*(\d+)\.\s+(Breakdown|Rip|Crosscut) · (?:mark|fence|stop) (.+?)\s+(\d+) cuts?\b/gm)].map((m) => ({ n: Number(m[1]), kind: m[2].toLowerCase(), setting: m[3].trim(), count: Number(m[4]) }));
    const expected = result.plan.setups.map((x, i) => ({ n: i + 1, kind: x.kind, setting: sheetLength(Math.round(x.setting * 1000), "mm"), count: x.count }));
    expect(expected.length).toBeGreaterThan(1);
    expect(listed).toEqual(expected);
    // Each part is cut to length at one stop: 5 number cards at 210 mm, the sign face at 600 mm.
    const stops = out.split(/^\s*\d+\.\s+/m).filter((block) => block.startsWith("Crosscut"));
    const sized = stops.map((block) => [block.match(/stop (\S+ mm)/)![1], [...block.matchAll(/(\d+) × (Number card|Sign face) /g)].map((m) => `${m[1]} ${m[2]}`)]);
    expect(sized).toEqual(expect.arrayContaining([["600 mm", ["1 Sign face"]], ["210 mm", ["5 Number card"]]]));
    expect(out).toContain(code);
    expect(out).toContain("Birch plywood 6 mm");
  });

  it("carries the cautions and warns when the plan names no sled", async () => {
    const out = flat(text(pdfOf(await get(`/batches/${six}/setup-sheet`, sawyer), "default")));
    for (const caution of [
      "Blade guard and riving knife",
      "Push stick when the fence is closer than 150 mm",
      "push block under 50 mm",
      "out of the line of kickback",
      "Never use the rip fence as a length stop when crosscutting",
      "stop block on the sled's fence before the blade",
      "saw maker's manual and your local rules come first",
    ]) expect(out).toContain(caution);
    expect(out).toContain("WARNING: SLED");
    expect(out).toContain("Sled: none chosen in the plan settings.");
    expect(out).toContain("Saw: none chosen in the plan settings.");
    expect(out).toContain("1 × stock panel 2440 × 1220 mm");
  });

  it("comes on A4 and US Letter, with IBM Plex Sans embedded", async () => {
    const a4 = pdfOf(await get(`/batches/${six}/setup-sheet?paper=a4`, sawyer), "size-a4");
    const letter = pdfOf(await get(`/batches/${six}/setup-sheet?paper=letter`, sawyer), "size-letter");
    expect(execFileSync("pdfinfo", [a4], { encoding: "utf8" })).toMatch(/Page size:\s+595\.28 x 841\.89 pts \(A4\)/);
    expect(execFileSync("pdfinfo", [letter], { encoding: "utf8" })).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
    const fonts = execFileSync("pdffonts", [a4], { encoding: "utf8" });
    expect(fonts).toMatch(/IBMPlexSans-Regular\s+CID TrueType\s+Identity-H\s+yes\s+yes/);
    expect(fonts).toMatch(/IBMPlexSans-Bold/);
    expect((await get(`/batches/${six}/setup-sheet?paper=a3`, sawyer)).status).toBe(400);
  });

  it("answers only floor roles, only for this shop's released batches", async () => {
    const books = await signIn(server, s.shop.users.bookkeeper);
    expect((await get(`/batches/${six}/setup-sheet`, books)).status).toBe(403);
    expect((await get(`/batches/${six}/labels`, books)).status).toBe(403);
    for (const role of ["owner", "planner"] as const) expect((await get(`/batches/${six}/setup-sheet`, await signIn(server, s.shop.users[role]))).status).toBe(200);
    const unreleased = await get(`/batches/${three}/setup-sheet`, sawyer);
    expect(unreleased.status).toBe(404);
    expect(unreleased.body.toString()).toContain("No released batch");
    expect((await get(`/batches/${three}/labels`, sawyer)).status).toBe(404);
    const other = await batchScenario();
    const otherSawyer = await signIn(server, other.shop.users.sawyer);
    expect((await get(`/batches/${six}/setup-sheet`, otherSawyer)).status).toBe(404);
    expect((await get(`/batches/${six}/labels`, otherSawyer)).status).toBe(404);
    expect((await get(`/batches/not-a-uuid/setup-sheet`, sawyer)).status).toBe(404);
  });

  it("prints figures in an inch shop's unit, marking rounded ones with their millimetres; Letter by default", async () => {
    await db.update(t.shops).set({ displayUnit: "in" }).where(eq(t.shops.id, s.shop.id));
    try {
      const file = pdfOf(await get(`/batches/${six}/setup-sheet`, sawyer), "inch");
      const out = flat(text(file));
      // 2440 mm = 96.063 in → 96-1/16; 1220 mm = 48.031 in → 48-1/32 (TRADE-FACTS §5, 1 in = 25.4 mm exactly)
      expect(out).toContain("stock panel ≈ 96-1/16 in (2440 mm) × ≈ 48-1/32 in (1220 mm)");
      expect(out).toContain("fence ≈ 5-29/32 in (150 mm)"); // 150 mm = 5.9055 in → 189/32
      expect(execFileSync("pdfinfo", [file], { encoding: "utf8" })).toMatch(/Page size:\s+612 x 792 pts/);
    } finally {
      await db.update(t.shops).set({ displayUnit: "mm" }).where(eq(t.shops.id, s.shop.id));
    }
  });

  it("prints one label per part, with names in any script", async () => {
    // The scenario's parts: 5 number cards and 1 sign face sawn, plus the laser items' blanks.
    const res = await get(`/batches/${six}/labels?paper=letter`, sawyer);
    expect(res.status).toBe(200);
    expect(res.headers["content-disposition"]).toMatch(/^inline; filename="B-\d{4}-labels\.pdf"$/);
    const out = text(pdfOf(res, "labels"));
    expect(out.match(/Number card/g)).toHaveLength(5);
    expect(out.match(/Sign face/g)).toHaveLength(1);
    for (const n of ["Zoë", "Nguyễn Thảo", "Table 3", "Table A", "Table B"]) expect(out).toContain(n);
  });
});

describe("the sled on the sheet", () => {
  it("warns when the chosen sled has no check, and not once it has a fresh one within tolerance", async () => {
    const s = await batchScenario();
    await createBatches(s.shop.id, "2027-01-15");
    const [six] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    const sawId = await addSaw(s.shop.id, { name: "Cabinet saw", blade: "" });
    await recordKerf(s.shop.id, sawId, s.shop.users.sawyer.id, { kerfUm: 3200, note: "" });
    const sledId = (await addSled(s.shop.id, { name: "Big sled", sawId, stopMinUm: 20_000, stopMaxUm: 1_200_000, widestUm: 610_000 }))!;
    const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: 812_000, widthUm: 430_000, location: "Rack A, slot 2" }).returning();
    await release(s.shop.id, six.id, { sawId, sledId, offcutIds: [offcut.id] });
    const sawyer = await signIn(server, s.shop.users.sawyer);

    const before = flat(text(pdfOf(await get(`/batches/${six.id}/setup-sheet`, sawyer), "sled-before")));
    expect(before).toContain("WARNING: SLED");
    expect(before).toContain("This sled has no squareness check on record");
    expect(before).toContain("Sled: Big sled · stop block 20 mm to 1200 mm");
    expect(before).toContain("Saw: Cabinet saw · kerf 3.20 mm assumed by the plan (Cabinet saw's latest test cut)");
    expect(before).toMatch(/Racked offcut 812 × 430 mm from Rack A, slot 2 — panel \d/);

    await recordSledCheck(s.shop.id, sledId, s.shop.users.sawyer.id, { widthFirstEndUm: 25_020, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 });
    const after = flat(text(pdfOf(await get(`/batches/${six.id}/setup-sheet`, sawyer), "sled-after")));
    expect(after).not.toContain("WARNING");
    expect(after).toContain("Last five-cut check");
    expect(after).toContain("error 0.013 mm per metre"); // 0.02 mm / (4 × 400 mm) × 1000 mm

    // Out of tolerance: 1 mm of taper over 400 mm is 0.625 mm per metre, above 0.15.
    await recordSledCheck(s.shop.id, sledId, s.shop.users.sawyer.id, { widthFirstEndUm: 26_000, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 });
    const out = flat(text(pdfOf(await get(`/batches/${six.id}/setup-sheet`, sawyer), "sled-out")));
    expect(out).toContain("WARNING: SLED");
    expect(out).toContain("out of the shop's tolerance");
  });
});

describe("the set-up sheet of a batch already cut", () => {
  it("shows the sled's check and the saw's kerf as they stood the day it was cut, not later ones", async () => {
    const s = await batchScenario();
    await createBatches(s.shop.id, "2027-01-15");
    const [six] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    const day = (n: number) => new Date(Date.now() + n * 86_400_000);
    const sawId = await addSaw(s.shop.id, { name: "Cabinet saw", blade: "" });
    await recordKerf(s.shop.id, sawId, s.shop.users.sawyer.id, { kerfUm: 3200, note: "" }, day(-3));
    const sledId = (await addSled(s.shop.id, { name: "Big sled", sawId, stopMinUm: 20_000, stopMaxUm: 1_200_000, widestUm: 610_000 }))!;
    await recordSledCheck(s.shop.id, sledId, s.shop.users.sawyer.id, { widthFirstEndUm: 25_020, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 }, day(-3));
    await release(s.shop.id, six.id, { sawId, sledId });
    await db.update(t.batches).set({ status: "cut", cutAt: day(-2) }).where(eq(t.batches.id, six.id));
    // After the cut: the sled knocked out of square, and a new blade measured wider.
    await recordSledCheck(s.shop.id, sledId, s.shop.users.sawyer.id, { widthFirstEndUm: 26_000, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 }, day(-1));
    await recordKerf(s.shop.id, sawId, s.shop.users.sawyer.id, { kerfUm: 3400, note: "new blade" }, day(-1));

    const sheet = flat(text(pdfOf(await get(`/batches/${six.id}/setup-sheet`, await signIn(server, s.shop.users.sawyer)), "cut-batch")));
    expect(sheet).not.toContain("WARNING");
    const cutDay = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" }).format(day(-2));
    expect(sheet).toContain(`cut ${cutDay}, shown as it stood that day`);
    expect(sheet).toContain("(1 day before the cut)");
    expect(sheet).toContain("error 0.013 mm per metre"); // the check of day −3: 0.02 mm / (4 × 400 mm) × 1000 mm
    expect(sheet).not.toContain("0.625 mm per metre"); // the check after the cut
    expect(sheet).toContain("kerf 3.20 mm");
    expect(sheet).not.toContain("3.40 mm");
  });
});

describe("golden set-up sheet of the demo batch (for review)", () => {
  it("renders the demo's 6 mm birch batch to PNG in test/.artifacts", async () => {
    // The demo shop, once per test database (nothing else in the suite seeds it).
    let [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    if (!demo) {
      await seedDemo(db);
      [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    }
    const [birch6] = await db.select().from(t.materials).where(and(eq(t.materials.shopId, demo.id), eq(t.materials.name, "Birch plywood 6 mm")));
    await createBatches(demo.id, "2099-12-31", [birch6.id]);
    // Not last month's cut batches, which the demo history (seeded by another suite) may have added first.
    const [batch] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, demo.id), eq(t.batches.materialId, birch6.id), inArray(t.batches.status, ["open", "released"])));
    const [saw] = await db.select().from(t.saws).where(eq(t.saws.shopId, demo.id));
    const [sled] = await db.select().from(t.sleds).where(eq(t.sleds.shopId, demo.id));
    if (batch.status === "open") await release(demo.id, batch.id, { sawId: saw.id, sledId: sled.id, stages: 3, timeLimitMs: 1500 });
    const [sawyerRow] = await db.select().from(t.users).where(eq(t.users.email, "sawyer@tallowmere.example"));
    const cookie = await signIn(server, { email: sawyerRow.email, password: "tallowmere-demo-2026" });
    const res = await get(`/batches/${batch.id}/setup-sheet?paper=a4`, cookie);
    expect(res.status).toBe(200);
    const out = flat(text(pdfOf(res, "golden")));
    expect(out).not.toContain("WARNING"); // the demo sled was checked a week ago, within tolerance
    expect(out).toContain("Sled: Big sled");
    const dir = join(process.cwd(), "test", ".artifacts");
    mkdirSync(dir, { recursive: true });
    execFileSync("pdftoppm", ["-r", "60", "-png", join(work, "golden.pdf"), join(dir, "setup-sheet-golden")]);
    const labels = await get(`/batches/${batch.id}/labels?paper=a4`, cookie);
    expect(labels.status).toBe(200);
    execFileSync("pdftoppm", ["-r", "60", "-png", "-f", "1", "-l", "1", pdfOf(labels, "golden-labels"), join(dir, "labels-golden")]);
    expect(readdirSync(dir).some((f) => f.startsWith("setup-sheet-golden"))).toBe(true);

    // Scrap looks as on screen (lib/panel-look.ts): the pale red ground with its hatch lines, and none
    // of the old flat grey. The demo sheet has no sled warning, the one other pale red box.
    const pixels = rasterPixels(join(work, "golden.pdf"));
    const count = (test: (r: number, g: number, b: number) => boolean) => pixels.reduce((n, [r, g, b]) => n + (test(r, g, b) ? 1 : 0), 0);
    expect(count((r, g, b) => r === 0xe6 && g === 0xe1 && b === 0xd8)).toBe(0);
    expect(count((r, g, b) => r === 0xf8 && g === 0xde && b === 0xde)).toBeGreaterThan(200); // the ground between the lines
    expect(count((r, g, b) => r > 170 && r < 235 && g > 100 && g < 180 && Math.abs(g - b) < 12 && r - g > 45)).toBeGreaterThan(100); // the lines: red at half strength on the ground
  });
});
