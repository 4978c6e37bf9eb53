import { eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { shops } from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { depositFormValues } from "~/lib/deposits";
import { settingsFormValues } from "~/lib/shop-settings";
import { createOrder } from "~/models/orders.server";
import { createCatalogue } from "../support/order-factories";

const server = await appServer();

async function stored(shopId: string) {
  const [row] = await getDb().select().from(shops).where(eq(shops.id, shopId));
  return row;
}

/** The form exactly as the page shows it for the stored settings, with some fields changed. */
async function form(shopId: string, changes: Record<string, string> = {}) {
  const shop = await stored(shopId);
  return { ...settingsFormValues(shop), ...depositFormValues(shop, shop.currency), ...changes };
}

describe("shop settings", () => {
  it("shows the stored settings formatted in the shop's unit", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server).get("/settings").set("Cookie", owner);
    expect(res.status).toBe(200);
    expect(res.text).toContain('value="3.2 mm"'); // default kerf 3200 µm
    expect(res.text).toContain('value="40000 mm²"');
    expect(res.text).toContain("Save settings");
  });

  it("saves lengths typed bare (in the chosen unit) or with a unit, as micrometres", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server)
      .post("/settings")
      .set("Cookie", owner)
      .type("form")
      .send(await form(shop.id, { currency: "USD", kerfUm: "2.8", edgeTrimUm: "0", laserBedLengthUm: '23 5/8"', stopMinUm: "15 mm", stopMaxUm: "1.1 m", minOffcutAreaMm2: "450 cm²" }));
    expect(res.status).toBe(200);
    expect(res.text).toContain("Settings saved.");
    expect(await stored(shop.id)).toMatchObject({
      currency: "USD",
      kerfUm: 2800,
      edgeTrimUm: 0,
      laserBedLengthUm: 600_075,
      stopMinUm: 15_000,
      stopMaxUm: 1_100_000,
      minOffcutAreaMm2: 45_000,
    });
  });

  it("switching to inches reads bare numbers as inches, and fields left as shown keep their exact value", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const before = await stored(shop.id);
    const res = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { displayUnit: "in", kerfUm: "1/8" }));
    expect(res.status).toBe(200);
    const after = await stored(shop.id);
    expect(after).toMatchObject({ displayUnit: "in", kerfUm: 3175, edgeTrimUm: before.edgeTrimUm, ripMaxUm: before.ripMaxUm });

    // Shown as 29-29/32 in (rounded); saving the form untouched must not move it to the 1/32 grid.
    const again = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id));
    expect(again.status).toBe(200);
    expect((await stored(shop.id)).ripMaxUm).toBe(before.ripMaxUm);
    expect((await request(server).get("/settings").set("Cookie", owner)).text).toContain('value="1/8 in"');
  });

  it("refuses nonsense with a message on each bad field, keeps what was typed, and saves nothing", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const before = await stored(shop.id);
    const res = await request(server)
      .post("/settings")
      .set("Cookie", owner)
      .type("form")
      .send(
        await form(shop.id, {
          kerfUm: "12",
          laserBedWidthUm: "wide",
          laserSpacingUm: "0",
          stopMinUm: "900",
          stopMaxUm: "800",
          minOffcutAreaMm2: "-5",
          currency: "XYZ",
          displayUnit: "furlongs",
        }),
      );
    expect(res.status).toBe(400);
    expect(res.text).toContain("Nothing was saved");
    expect(res.text).toMatch(/id="field-kerfUm-error"[^>]*>Must be between 0.1 mm and 10 mm\./);
    expect(res.text).toContain('id="field-laserBedWidthUm-error"');
    expect(res.text).toMatch(/id="field-laserSpacingUm-error"[^>]*>Must be more than zero\./);
    expect(res.text).toMatch(/id="field-stopMaxUm-error"[^>]*>Must be further than the nearest stop setting\./);
    expect(res.text).toContain('id="field-minOffcutAreaMm2-error"');
    expect(res.text).toContain('id="field-currency-error"');
    expect(res.text).toContain('id="field-displayUnit-error"');
    expect(res.text).toContain('value="12"');
    expect(res.text).toContain('value="wide"');
    expect(await stored(shop.id)).toEqual(before);
  });

  it("sets the sled's squareness tolerance, per metre or per foot, and refuses nonsense on that field", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    expect((await request(server).get("/settings").set("Cookie", owner)).text).toContain('value="0.150 mm/m"'); // the default, 150 µm per metre
    const saved = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { sledToleranceUmPerM: "0.003 in/ft" }));
    expect(saved.status).toBe(200);
    expect((await stored(shop.id)).sledToleranceUmPerM).toBe(250); // 0.003 × 25 400 µm / 0.3048 m
    const before = await stored(shop.id);
    const bad = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { sledToleranceUmPerM: "square enough" }));
    expect(bad.status).toBe(400);
    expect(bad.text).toMatch(/id="field-sledToleranceUmPerM-error"[^>]*>Enter an error per length of cut, such as 0.15 mm\/m\./);
    expect(await stored(shop.id)).toEqual(before);
    // The sled page judges checks by it.
    expect(visible((await request(server).get("/sleds").set("Cookie", owner)).text)).toContain("tolerance (0.250 mm per metre)");
  });

  it("sets the shop's time zone, and the order page tells its times on that clock; an unknown zone is refused on its field", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const bad = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { timeZone: "Mars/Olympus" }));
    expect(bad.status).toBe(400);
    expect(visible(bad.text)).toContain("Choose the shop's time zone from the list.");
    expect((await stored(shop.id)).timeZone).toBe("UTC");
    const saved = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { timeZone: "America/New_York" }));
    expect(saved.status).toBe(200);
    expect((await stored(shop.id)).timeZone).toBe("America/New_York");
    const page = await request(server).get("/settings").set("Cookie", owner);
    expect(page.text).toMatch(/<option value="America\/New_York" selected="">America\/New York<\/option>/);

    const cat = await createCatalogue(shop.id);
    const order = await createOrder(shop.id, { customerId: cat.customer.id, eventDate: "2027-03-20", dueDate: "2027-03-06", notes: "" }, [{ productId: cat.sign.id, quantity: 1, personalisation: [], notes: "", files: [] }], {
      by: shop.users.owner.id,
      at: new Date("2027-03-10T03:00:00Z"),
    });
    const history = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(history).toContain("9 Mar 2027, 22:00 GMT-5"); // 03:00 UTC on the 10th is the evening of the 9th in New York
  });

  it("checks the stop range even when every other field is fine", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { stopMinUm: "500", stopMaxUm: "500" }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('id="field-stopMaxUm-error"');
    expect(res.text).not.toContain('id="field-stopMinUm-error"');
  });

  it("the planner sees the settings read-only and cannot change them; sawyer and bookkeeper get 403", async () => {
    const shop = await createShop("Settings");
    const before = await stored(shop.id);
    const planner = await signIn(server, shop.users.planner);
    const page = await request(server).get("/settings").set("Cookie", planner);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Read only");
    expect(page.text).toContain("3.2 mm");
    expect(page.text).not.toContain("Save settings");
    expect(page.text).not.toContain('name="kerfUm"');

    for (const role of ["planner", "sawyer", "bookkeeper"] as const) {
      const cookie = role === "planner" ? planner : await signIn(server, shop.users[role]);
      const res = await request(server).post("/settings").set("Cookie", cookie).type("form").send(await form(shop.id, { kerfUm: "2" }));
      expect(res.status, role).toBe(403);
    }
    for (const role of ["sawyer", "bookkeeper"] as const) {
      expect((await request(server).get("/settings").set("Cookie", await signIn(server, shop.users[role]))).status, role).toBe(403);
    }
    expect(await stored(shop.id)).toEqual(before);
  });

  it("changes only the signed-in owner's shop", async () => {
    const mine = await createShop("Settings");
    const theirs = await createShop("Settings");
    const before = await stored(theirs.id);
    const owner = await signIn(server, mine.users.owner);
    expect((await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(mine.id, { kerfUm: "2.2" }))).status).toBe(200);
    expect((await stored(mine.id)).kerfUm).toBe(2200);
    expect(await stored(theirs.id)).toEqual(before);
  });

  it("saves a deposit rule: a percentage, or a fixed amount read in the currency on the form", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const percent = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { depositRule: "percent", depositPercent: "30 %" }));
    expect(percent.status).toBe(200);
    expect(await stored(shop.id)).toMatchObject({ depositRule: "percent", depositPercent: 30, depositFixedMinor: null });
    expect((await request(server).get("/settings").set("Cookie", owner)).text).toContain('name="depositPercent" value="30"');

    const fixed = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { currency: "JPY", depositRule: "fixed", depositFixedMinor: "5000" }));
    expect(fixed.status).toBe(200);
    expect(await stored(shop.id)).toMatchObject({ currency: "JPY", depositRule: "fixed", depositPercent: 30, depositFixedMinor: 5000 });

    const none = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, { depositRule: "none" }));
    expect(none.status).toBe(200);
    expect((await stored(shop.id)).depositRule).toBe("none");

    const planner = await signIn(server, shop.users.planner);
    expect(visible((await request(server).get("/settings").set("Cookie", planner)).text)).toContain("No deposit is asked");
  });

  it("refuses a bad deposit rule with a message on the field concerned, and saves nothing", async () => {
    const shop = await createShop("Settings");
    const owner = await signIn(server, shop.users.owner);
    const before = await stored(shop.id);
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ depositRule: "percent", depositPercent: "" }, "depositPercent", /Enter the percentage of the order total to ask\./],
      [{ depositRule: "percent", depositPercent: "150" }, "depositPercent", /Must be between 1 % and 100 %\./],
      [{ depositRule: "percent", depositPercent: "12.5" }, "depositPercent", /Enter a whole percentage, such as 30\./],
      [{ depositRule: "fixed", depositFixedMinor: "" }, "depositFixedMinor", /Enter the amount to ask\./],
      [{ depositRule: "fixed", depositFixedMinor: "-5" }, "depositFixedMinor", /Enter an amount in EUR above zero, such as 50\.00\./],
      [{ depositRule: "fixed", depositFixedMinor: "12.345" }, "depositFixedMinor", /Enter an amount in EUR above zero/],
      [{ depositRule: "half" }, "depositRule", /Choose how the deposit is worked out\./],
      // The field not chosen is still checked when filled in.
      [{ depositRule: "percent", depositPercent: "25", depositFixedMinor: "lots" }, "depositFixedMinor", /Enter an amount in EUR above zero/],
    ];
    for (const [changes, field, message] of cases) {
      const res = await request(server).post("/settings").set("Cookie", owner).type("form").send(await form(shop.id, changes));
      expect(res.status, JSON.stringify(changes)).toBe(400);
      const html = visible(res.text);
      expect(html, JSON.stringify(changes)).toMatch(new RegExp(`id="field-${field}-error"[^>]*>${message.source}`));
      expect(html).toContain("Nothing was saved");
    }
    expect(await stored(shop.id)).toEqual(before);
  });
});
