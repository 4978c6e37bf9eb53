// A product's life in the catalogue: retired products leave the list of new orders but stay on the
// orders that have them; a product no order names can be deleted for good, parts and all.
import { and, eq } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { getDb } from "~/db.server";
import { createOrder } from "~/models/orders.server";

const server = await appServer();
let shop: TestShop;
let catalogue: Awaited<ReturnType<typeof createCatalogue>>;
let owner: string;
let orderId: string;

beforeAll(async () => {
  shop = await createShop("Product life");
  catalogue = await createCatalogue(shop.id);
  owner = await signIn(server, shop.users.owner);
  ({ id: orderId } = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: "2027-03-06", dueDate: "2027-02-20", notes: "" }, [
    { productId: catalogue.tableNumber.id, quantity: 2, personalisation: ["Table 1", "Table 2"], notes: "", files: [] },
  ]));
});

const post = (path: string, fields: Record<string, string>, cookie = owner) => request(server).post(path).set("Cookie", cookie).type("form").send(fields);
const productRow = async (id: string) => (await getDb().select().from(t.products).where(eq(t.products.id, id)))[0];

describe("retiring a product", () => {
  it("takes it off new orders, keeps it on the order that has it, and brings it back", async () => {
    const path = `/catalogue/products/${catalogue.tableNumber.id}`;
    const page = await request(server).get(path).set("Cookie", owner);
    expect(visible(page.text)).toContain("On 1 order line in 1 order.");
    expect(page.text).not.toContain("Delete for good"); // it was ordered

    const retired = await post(path, { intent: "retire" });
    expect(retired.status).toBe(200);
    expect(visible(retired.text)).toContain("Table number is retired: new orders no longer offer it.");
    const firstDate = (await productRow(catalogue.tableNumber.id)).retiredAt;
    expect(firstDate).toBeInstanceOf(Date);
    await post(path, { intent: "retire" }); // twice keeps the first date
    expect((await productRow(catalogue.tableNumber.id)).retiredAt).toEqual(firstDate);

    // New orders: not offered, and a hand-made post naming it is refused on the field.
    const form = await request(server).get("/orders/new").set("Cookie", owner);
    expect(form.text).toContain("Welcome sign");
    expect(form.text).not.toContain(">Table number<");
    const refused = await request(server).post("/orders/new").set("Cookie", owner).field("customerId", catalogue.customer.id).field("eventDate", "2027-03-06").field("line-0-product", catalogue.tableNumber.id).field("line-0-quantity", "1");
    expect(refused.status).toBe(400);
    expect(visible(refused.text)).toContain("That product is not offered in this shop's catalogue (it may have been retired).");
    // Adding it to an existing order is refused the same way; the order keeps its own line.
    const added = await request(server).post(`/orders/${orderId}`).set("Cookie", owner).field("intent", "add-lines").field("line-0-product", catalogue.tableNumber.id).field("line-0-quantity", "1");
    expect(added.status).toBe(400);
    const lines = await getDb().select().from(t.orderLines).where(eq(t.orderLines.orderId, orderId));
    expect(lines.map((l) => [l.productId, l.quantity])).toEqual([[catalogue.tableNumber.id, 2]]);
    expect(visible((await request(server).get(`/orders/${orderId}`).set("Cookie", owner)).text)).toContain("Table number");

    // The catalogue lists it only among the retired ones.
    expect((await request(server).get("/catalogue").set("Cookie", owner)).text).not.toContain(">Table number<");
    const listed = visible((await request(server).get("/catalogue?show=retired").set("Cookie", owner)).text);
    expect(listed).toContain("Table number");
    expect(listed).toContain("Retired");
    expect(listed).not.toContain("Welcome sign");
    expect(visible((await request(server).get("/catalogue?show=all").set("Cookie", owner)).text)).toMatch(/Place card[\s\S]*Table number[\s\S]*Welcome sign/);

    const back = await post(path, { intent: "restore" });
    expect(visible(back.text)).toContain("Table number is offered on new orders again.");
    expect((await productRow(catalogue.tableNumber.id)).retiredAt).toBeNull();
    expect((await request(server).get("/orders/new").set("Cookie", owner)).text).toContain(">Table number<");
  });

  it("only the owner retires or deletes; another shop's product is not found", async () => {
    const planner = await signIn(server, shop.users.planner);
    expect((await post(`/catalogue/products/${catalogue.sign.id}`, { intent: "retire" }, planner)).status).toBe(403);
    const other = await createShop("Other product shop");
    const otherOwner = await signIn(server, other.users.owner);
    expect((await post(`/catalogue/products/${catalogue.sign.id}`, { intent: "retire" }, otherOwner)).status).toBe(404);
    expect((await post(`/catalogue/products/${catalogue.sign.id}`, { intent: "delete-product" }, otherOwner)).status).toBe(404);
    expect((await productRow(catalogue.sign.id)).retiredAt).toBeNull();
    // On the new-product form there is nothing to retire yet.
    const early = await post("/catalogue/products/new", { intent: "retire" });
    expect(early.status).toBe(400);
    expect(visible(early.text)).toContain("There is no product to retire or delete yet: save it first.");
  });
});

describe("deleting a product", () => {
  it("is refused once an order names it, and nothing changes", async () => {
    const res = await post(`/catalogue/products/${catalogue.tableNumber.id}`, { intent: "delete-product" });
    expect(res.status).toBe(409);
    expect(visible(res.text)).toContain("Table number was not deleted. It is on 1 order line, so it stays for those orders: retire it instead.");
    expect(await productRow(catalogue.tableNumber.id)).toBeDefined();
    expect(await getDb().select().from(t.productParts).where(eq(t.productParts.productId, catalogue.tableNumber.id))).toHaveLength(1);
  });

  it("takes a product no order names, with its parts, and says so on the catalogue", async () => {
    const page = await request(server).get(`/catalogue/products/${catalogue.placeCard.id}`).set("Cookie", owner);
    expect(visible(page.text)).toContain("Not on any order yet.");
    expect(page.text).toContain("Delete for good");
    const res = await post(`/catalogue/products/${catalogue.placeCard.id}`, { intent: "delete-product" });
    expect(res.status).toBe(302);
    expect(res.headers.location).toBe("/catalogue?deleted=Place%20card");
    expect(await productRow(catalogue.placeCard.id)).toBeUndefined();
    expect(await getDb().select().from(t.productParts).where(eq(t.productParts.productId, catalogue.placeCard.id))).toHaveLength(0);
    expect(visible((await request(server).get(res.headers.location).set("Cookie", owner)).text)).toContain("Place card was deleted.");
    expect((await request(server).get(`/catalogue/products/${catalogue.placeCard.id}`).set("Cookie", owner)).status).toBe(404);
    // The other products are untouched.
    const left = await getDb().select({ name: t.products.name }).from(t.products).where(and(eq(t.products.shopId, shop.id)));
    expect(left.map((p) => p.name).sort()).toEqual(["Table number", "Welcome sign"]);
  });
});
