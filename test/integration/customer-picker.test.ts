// The order form's customer picker: /api/customers (this shop's, at most 20, checked query) and the
// form read without JavaScript, where the posted text alone names the customer.
import { and, eq } from "drizzle-orm";
import fc from "fast-check";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { getDb } from "~/db.server";

const server = await appServer();
const db = getDb();
let shop: TestShop;
let other: TestShop;
let catalogue: Awaited<ReturnType<typeof createCatalogue>>;
let owner: string;

beforeAll(async () => {
  shop = await createShop("Picker");
  other = await createShop("Picker elsewhere");
  catalogue = await createCatalogue(shop.id);
  await db.insert(t.customers).values(Array.from({ length: 800 }, (_, i) => ({ shopId: shop.id, name: `Guest list ${String(i + 1).padStart(3, "0")}`, email: `list${i + 1}@example.com` })));
  await db.insert(t.customers).values([
    { shopId: shop.id, name: "Penhaligon party", email: "penhaligon@example.com" },
    { shopId: shop.id, name: "Sam Lee", email: "" },
    { shopId: shop.id, name: "Sam Lee", email: "" },
    { shopId: shop.id, name: "100% Pure café", email: "" },
    { shopId: shop.id, name: "Party Zebra", email: "" },
    { shopId: shop.id, name: "A party of two", email: "" },
    { shopId: other.id, name: "Penhaligon elsewhere", email: "" },
  ]);
  owner = await signIn(server, shop.users.owner);
});

const search = (q: string, cookie = owner) => request(server).get(`/api/customers?q=${encodeURIComponent(q)}`).set("Cookie", cookie);
const names = (res: request.Response) => (res.body.customers as { name: string }[]).map((c) => c.name);
const newOrder = (customer: Record<string, string>) => {
  const req = request(server).post("/orders/new").set("Cookie", owner);
  for (const [k, val] of Object.entries({ ...customer, eventDate: "2027-03-20", "line-0-product": catalogue.sign.id, "line-0-quantity": "1" })) req.field(k, val);
  return req;
};
const customerOf = async (orderId: string) => (await db.select().from(t.orders).where(eq(t.orders.id, orderId)))[0].customerId;
const idOf = async (name: string, shopId = shop.id) => (await db.select().from(t.customers).where(and(eq(t.customers.shopId, shopId), eq(t.customers.name, name))))[0].id;

describe("/api/customers", () => {
  it("answers at most 20 of this shop's customers, matching name or e-mail, those starting with the text first", async () => {
    const all = await search("");
    expect(all.status).toBe(200);
    expect(all.body.customers).toHaveLength(20);
    expect(names(await search("penh"))).toEqual(["Penhaligon party"]); // not the other shop's
    expect(names(await search("LIST12@EXAMPLE"))).toEqual(["Guest list 012"]); // by e-mail, any case
    expect(names(await search("party"))).toEqual(["Party Zebra", "A party of two", "Penhaligon party"]); // starting with it first, then by name
    expect(names(await search("100%"))).toEqual(["100% Pure café"]); // % is a character, not a wildcard
    expect(names(await search("list 7")).every((n) => n.startsWith("Guest list 7"))).toBe(true);
  });

  it("checks its query and its caller", async () => {
    const long = await search("x".repeat(161));
    expect(long.status).toBe(400);
    expect(long.body).toEqual({ error: "Search with at most 160 characters.", field: "q" });
    expect((await request(server).get("/api/customers?q=penh")).status).toBe(401);
    const sawyer = await signIn(server, shop.users.sawyer);
    expect((await search("penh", sawyer)).status).toBe(403);
    const elsewhere = await signIn(server, other.users.owner);
    expect(names(await search("penh", elsewhere))).toEqual(["Penhaligon elsewhere"]);
  });

  it("any query text answers 200 with at most 20, or 400 naming the field; never 5xx", async () => {
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.string({ maxLength: 200 }), fc.string({ unit: "grapheme", maxLength: 30 }), fc.constantFrom("%", "_", "\\", "'", "' or 1=1 --", "\u0000", "a\u0000b")), async (q) => {
        const res = await search(q);
        expect([200, 400]).toContain(res.status);
        if (res.status === 200) expect(res.body.customers.length).toBeLessThanOrEqual(20);
        else expect(res.body.field).toBe("q");
      }),
      { numRuns: 60 },
    );
  });
});

describe("the order form's customer field", () => {
  it("ships a text field with 20 suggestions, not a list of every customer; a customer's link fills it in", async () => {
    const page = await request(server).get("/orders/new").set("Cookie", owner);
    expect(page.status).toBe(200);
    expect(page.text).not.toContain('<select name="customerId"');
    expect((page.text.match(/<datalist[^>]*>(.*?)<\/datalist>/s)![1].match(/<option /g) ?? []).length).toBe(20);
    expect(page.text).not.toContain("Guest list 800");
    const penhaligon = await idOf("Penhaligon party");
    const linked = visible((await request(server).get(`/orders/new?customer=${penhaligon}`).set("Cookie", owner)).text);
    expect(linked).toContain('value="Penhaligon party (penhaligon@example.com)"');
    expect(linked).toContain(`name="customerId" value="${penhaligon}"`);
  });

  it("without JavaScript the typed name is enough; a part of one is refused with suggestions, and a name two share asks for more", async () => {
    const made = await newOrder({ customer: "penhaligon PARTY" });
    expect(made.status).toBe(302);
    expect(await customerOf(made.headers.location.split("/").pop()!)).toBe(await idOf("Penhaligon party"));

    const part = await newOrder({ customer: "Guest list 7" });
    expect(part.status).toBe(400);
    const refused = visible(part.text);
    expect(refused).toContain("No customer is called “Guest list 7”; pick one from the list.");
    expect(refused).toContain('id="field-customerId-error"');
    expect(refused).toContain('<option value="Guest list 700 (list700@example.com)">');

    const twins = await newOrder({ customer: "Sam Lee" });
    expect(twins.status).toBe(400);
    expect(visible(twins.text)).toContain("Several customers are called “Sam Lee”");
    const nobody = await newOrder({ customer: "Nobody at all" });
    expect(visible(nobody.text)).toContain("No customer matches “Nobody at all”. Add them under Customers first.");
    expect((await newOrder({ customer: "" })).status).toBe(400);
    expect(visible((await newOrder({ customer: "Pen\u0000" })).text)).toContain("A customer's name has no control characters.");
  });

  it("the picker's id counts only while its customer's label is the text; a plain id still works", async () => {
    const penhaligon = await idOf("Penhaligon party");
    const both = await newOrder({ customer: "Penhaligon party (penhaligon@example.com)", customerId: penhaligon });
    expect(await customerOf(both.headers.location.split("/").pop()!)).toBe(penhaligon);
    // Text changed without JavaScript, the old id still beside it: the text wins.
    const stale = await newOrder({ customer: "Guest list 042", customerId: penhaligon });
    expect(await customerOf(stale.headers.location.split("/").pop()!)).toBe(await idOf("Guest list 042"));
    const idOnly = await newOrder({ customerId: catalogue.customer.id });
    expect(await customerOf(idOnly.headers.location.split("/").pop()!)).toBe(catalogue.customer.id);
    const foreign = await newOrder({ customerId: await idOf("Penhaligon elsewhere", other.id) });
    expect(foreign.status).toBe(400); // another shop's customer is no choice here
  });

  it("an order's customer changes by typed name on its page, which ships no list of every customer", async () => {
    const made = await newOrder({ customer: "Penhaligon party" });
    const orderId = made.headers.location.split("/").pop()!;
    const page = await request(server).get(`/orders/${orderId}`).set("Cookie", owner);
    expect(page.text).not.toContain("Guest list 800");
    expect(visible(page.text)).toContain('value="Penhaligon party (penhaligon@example.com)"');
    const changed = await request(server).post(`/orders/${orderId}`).set("Cookie", owner).field("intent", "header").field("customer", "Guest list 333").field("eventDate", "2027-03-21").field("dueDate", "2027-03-01").field("notes", "");
    expect(changed.status).toBe(302);
    expect(await customerOf(orderId)).toBe(await idOf("Guest list 333"));
    const refused = await request(server).post(`/orders/${orderId}`).set("Cookie", owner).field("intent", "header").field("customer", "Sam Lee").field("eventDate", "2027-03-21").field("dueDate", "").field("notes", "");
    expect(refused.status).toBe(400);
    expect(visible(refused.text)).toContain("Several customers are called “Sam Lee”");
    expect(await customerOf(orderId)).toBe(await idOf("Guest list 333"));
  });
});
