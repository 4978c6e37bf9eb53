import { and, desc, eq } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { getDb } from "~/db.server";

const server = await appServer();
const db = getDb();
/** The page's text with React's escapes undone, to look for sentences in it. */
const html = (res: request.Response) => visible(res.text).replace(/&#x27;/g, "'").replace(/&quot;/g, '"').replace(/&amp;/g, "&");
const post = (cookie: string, form: Record<string, string>) => request(server).post("/sleds").set("Cookie", cookie).type("form").send(form);

describe("sleds & saws", () => {
  let shop: TestShop;
  let other: TestShop;
  let sawyer: string;
  let owner: string;
  let sawId: string;
  let sledId: string;
  let otherSawId: string;
  let otherSledId: string;

  beforeAll(async () => {
    shop = await createShop("Sleds");
    other = await createShop("Other sleds");
    sawyer = await signIn(server, shop.users.sawyer);
    owner = await signIn(server, shop.users.owner);
    const [saw] = await db.insert(t.saws).values({ shopId: other.id, name: "Their saw" }).returning();
    const [sled] = await db.insert(t.sleds).values({ shopId: other.id, name: "Their sled", stopMinUm: 20_000, stopMaxUm: 900_000, widestUm: 500_000 }).returning();
    otherSawId = saw.id;
    otherSledId = sled.id;
  });

  it("shows the saw cautions, deferring to the saw maker's manual and the shop's rules", async () => {
    const page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("Guard and riving knife on");
    expect(page).toContain("The saw maker's manual and your shop's rules come first.");
  });

  it("adds a saw, and names what is missing", async () => {
    const bad = await post(sawyer, { intent: "add-saw", name: "  ", blade: "" });
    expect(bad.status).toBe(400);
    expect(visible(bad.text)).toContain("Enter a name.");
    const good = await post(sawyer, { intent: "add-saw", name: "Cabinet saw", blade: "250 mm, 3.2 mm full kerf" });
    expect(good.status).toBe(302);
    const [saw] = await db.select().from(t.saws).where(eq(t.saws.shopId, shop.id));
    expect(saw).toMatchObject({ name: "Cabinet saw", blade: "250 mm, 3.2 mm full kerf" });
    sawId = saw.id;
  });

  it("records kerf measurements within sane bounds and keeps the history; the latest is shown with a blade comparison", async () => {
    for (const [kerf, message] of [
      ["9", "Must be between 0.5 mm and 6 mm."],
      ["0.2", "Must be between 0.5 mm and 6 mm."],
      ["thin", "is not a length we can read"],
      ["", "Enter a length."],
    ]) {
      const res = await post(sawyer, { intent: "kerf", sawId, kerf, note: "" });
      expect(res.status, kerf).toBe(400);
      expect(visible(res.text)).toContain(message);
    }
    expect((await post(sawyer, { intent: "kerf", sawId, kerf: "2.4", note: "thin blade" })).status).toBe(302);
    expect((await post(sawyer, { intent: "kerf", sawId, kerf: '1/8"', note: "full kerf blade" })).status).toBe(302);
    const rows = await db.select().from(t.kerfMeasurements).where(eq(t.kerfMeasurements.sawId, sawId)).orderBy(desc(t.kerfMeasurements.measuredAt));
    expect(rows.map((r) => r.kerfUm)).toEqual([3175, 2400]); // 1/8 in = 3.175 mm exactly
    expect(rows[0].measuredBy).toBe(shop.users.sawyer.id);
    const page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("3.18 mm");
    expect(page).toContain("about what a full-kerf blade cuts");
    expect(page).toContain("Earlier measurements (1)");
    expect(page).toContain("thin blade");
    expect((await post(sawyer, { intent: "kerf", sawId: otherSawId, kerf: "3", note: "" })).status).toBe(404);
    expect((await post(sawyer, { intent: "kerf", sawId: "not-a-uuid", kerf: "3", note: "" })).status).toBe(400);
  });

  it("adds a sled with its stop range and widest piece", async () => {
    const range = await post(owner, { intent: "add-sled", name: "Big sled", sawId, stopMin: "900", stopMax: "20", widest: "610" });
    expect(range.status).toBe(400);
    expect(visible(range.text)).toContain("The stop range must end above where it starts.");
    const narrow = await post(owner, { intent: "add-sled", name: "", sawId, stopMin: "20", stopMax: "1200", widest: "10" });
    expect(narrow.status).toBe(400);
    expect(visible(narrow.text)).toContain("Must be between 50 mm and 3000 mm.");
    expect(visible(narrow.text)).toContain("Enter a name.");
    expect((await post(owner, { intent: "add-sled", name: "Big sled", sawId: otherSawId, stopMin: "20", stopMax: "1200", widest: "610" })).status).toBe(404);
    expect((await post(owner, { intent: "add-sled", name: "Big sled", sawId, stopMin: "20", stopMax: "1200", widest: "610" })).status).toBe(302);
    const [sled] = await db.select().from(t.sleds).where(eq(t.sleds.shopId, shop.id));
    expect(sled).toMatchObject({ sawId, stopMinUm: 20_000, stopMaxUm: 1_200_000, widestUm: 610_000 });
    sledId = sled.id;
    const page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("No squareness check on record");
  });

  it("records five-cut checks, shows error, correction and direction, and keeps the history", async () => {
    const bad = await post(sawyer, { intent: "check", sledId, widthA: "", widthB: "45", stripLength: "10", pivotDistance: "550" });
    expect(bad.status).toBe(400);
    const text = visible(bad.text);
    expect(text).toContain("Enter a length.");
    expect(text).toContain("Must be between 50 mm and 3000 mm.");
    const taper = await post(sawyer, { intent: "check", sledId, widthA: "10", widthB: "25", stripLength: "400", pivotDistance: "550" });
    expect(taper.status).toBe(400);
    expect(visible(taper.text)).toContain("The two ends differ by more than 10 mm");
    expect((await post(sawyer, { intent: "check", sledId: otherSledId, widthA: "27.89", widthB: "29.25", stripLength: "400", pivotDistance: "550" })).status).toBe(404);

    // TRADE-FACTS §4, Instructables worked example: −0.4675 mm at the adjustment point.
    expect((await post(sawyer, { intent: "check", sledId, widthA: "27.89", widthB: "29.25", stripLength: "400", pivotDistance: "550" })).status).toBe(302);
    let page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("−0.340 mm"); // error per cut
    expect(page).toContain("−0.850 mm per metre");
    expect(page).toContain("0.468 mm"); // 0.4675 to 0.001
    expect(page).toContain("push the fence's far end away from you");
    expect(page).toContain("Out of the shop's tolerance");

    expect((await post(sawyer, { intent: "check", sledId, widthA: "25.02", widthB: "25", stripLength: "400", pivotDistance: "550" })).status).toBe(302);
    page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("Within the shop's tolerance");
    expect(page).toContain("pull the fence's far end toward you");
    expect(page).toContain("Earlier checks (1)");
    const checks = await db.select().from(t.sledChecks).where(and(eq(t.sledChecks.sledId, sledId), eq(t.sledChecks.shopId, shop.id)));
    expect(checks).toHaveLength(2);
  });

  it("flags a check older than 90 days", async () => {
    const [sled] = await db.insert(t.sleds).values({ shopId: shop.id, name: "Old sled", stopMinUm: 20_000, stopMaxUm: 600_000, widestUm: 400_000 }).returning();
    await db.insert(t.sledChecks).values({ shopId: shop.id, sledId: sled.id, widthFirstEndUm: 25_000, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 500_000, checkedAt: new Date(Date.now() - 120 * 86_400_000) });
    const page = html(await request(server).get("/sleds").set("Cookie", sawyer));
    expect(page).toContain("This check is more than 90 days old");
  });

  it("lets the planner read but not write, keeps the bookkeeper out, and shows no other shop's saws", async () => {
    const planner = await signIn(server, shop.users.planner);
    const read = await request(server).get("/sleds").set("Cookie", planner);
    expect(read.status).toBe(200);
    expect(visible(read.text)).not.toContain("Record check");
    expect(visible(read.text)).not.toContain("Their saw");
    expect((await post(planner, { intent: "add-saw", name: "Sneaky saw", blade: "" })).status).toBe(403);
    expect((await post(planner, { intent: "kerf", sawId, kerf: "3", note: "" })).status).toBe(403);
    const books = await signIn(server, shop.users.bookkeeper);
    expect((await request(server).get("/sleds").set("Cookie", books)).status).toBe(403);
    expect((await db.select().from(t.saws).where(eq(t.saws.name, "Sneaky saw"))).length).toBe(0);
  });
});
