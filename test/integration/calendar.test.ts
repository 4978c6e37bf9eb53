// The calendar over HTTP: each order on its due day and its event day, in the month asked for.
import { eq } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import { orders } from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { getDb } from "~/db.server";
import { createOrder } from "~/models/orders.server";

const server = await appServer();
let shop: TestShop;
let ids: Record<string, string>;

beforeAll(async () => {
  shop = await createShop("Calendar");
  const cat = await createCatalogue(shop.id);
  const make = async (eventDate: string, dueDate: string) =>
    (await createOrder(shop.id, { customerId: cat.customer.id, eventDate, dueDate, notes: "" }, [{ productId: cat.sign.id, quantity: 1, personalisation: [], notes: "", files: [] }])).id;
  ids = { feb: await make("2027-02-20", "2027-02-06"), spill: await make("2027-03-13", "2027-02-27"), cancelled: await make("2027-02-13", "2027-02-01") };
  await getDb().update(orders).set({ status: "cancelled" }).where(eq(orders.id, ids.cancelled));
  const other = await createShop("Calendar elsewhere");
  const theirs = await createCatalogue(other.id);
  ids.theirs = (await createOrder(other.id, { customerId: theirs.customer.id, eventDate: "2027-02-20", dueDate: "2027-02-06", notes: "" }, [{ productId: theirs.sign.id, quantity: 1, personalisation: [], notes: "", files: [] }])).id;
});

const words = (html: string) => visible(html).replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

describe("the calendar", () => {
  it("puts each order on its due day and its event day, leaves out cancelled orders and other shops'", async () => {
    const res = await request(server).get("/calendar?month=2027-02").set("Cookie", await signIn(server, shop.users.planner));
    expect(res.status).toBe(200);
    const text = words(res.text);
    expect(text).toContain("February 2027");
    for (const id of [ids.feb, ids.spill]) expect(res.text).toContain(`href="/orders/${id}"`);
    for (const id of [ids.cancelled, ids.theirs]) expect(res.text).not.toContain(`/orders/${id}`);
    // The phone's list names the days: the due day, the event day, and the spill-over order's due day.
    expect(text).toMatch(/Sat, 6 Feb 2027 (Late|Due) #\d+/);
    expect(text).toMatch(/Sat, 20 Feb 2027 Event #\d+/);
    expect(text).toMatch(/Sat, 27 Feb 2027 (Late|Due) #\d+/);
    expect(text).toContain("← January 2027");
    expect(text).toContain("March 2027 →");
  });

  it("falls back to this month for a wrong month, and the sawyer may not read it", async () => {
    const owner = await signIn(server, shop.users.owner);
    const month = new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone: "UTC" }).format(new Date());
    for (const bad of ["2027-13", "junk", "1890-01"]) {
      const res = await request(server).get(`/calendar?month=${bad}`).set("Cookie", owner);
      expect(res.status).toBe(200);
      expect(words(res.text)).toContain(month);
    }
    expect((await request(server).get("/calendar").set("Cookie", await signIn(server, shop.users.sawyer))).status).toBe(403);
  });
});
