// Ids from another shop answer 404 and change nothing (OWASP ASVS 4.0.3 V4.2.1; ASVS 5.0 V8.2.2, V8.4.1).
// Every route that takes an id gets a case here.
import { eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { customers, invitations, orders, users } from "../../db/schema";
import { appServer } from "../support/app";
import { createShop, signIn } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { createOrder } from "~/models/orders.server";
import { getDb } from "~/db.server";

const server = await appServer();
const mine = await createShop("Mine");
const theirs = await createShop("Theirs");
const owner = await signIn(server, mine.users.owner);

describe("another shop's ids", () => {
  it("team: changing the role of another shop's member answers 404 and leaves them as they were", async () => {
    const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "role", memberId: theirs.users.sawyer.id, role: "owner" });
    expect(res.status).toBe(404);
    const [row] = await getDb().select().from(users).where(eq(users.id, theirs.users.sawyer.id));
    expect(row.role).toBe("sawyer");
  });

  it("team: removing another shop's member answers 404", async () => {
    const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "remove", memberId: theirs.users.planner.id });
    expect(res.status).toBe(404);
    expect(await getDb().select().from(users).where(eq(users.id, theirs.users.planner.id))).toHaveLength(1);
  });

  it("team: withdrawing another shop's invitation answers 404", async () => {
    const theirOwner = await signIn(server, theirs.users.owner);
    const email = `invitee-${Math.random().toString(36).slice(2)}@shop.test`;
    await request(server).post("/team").set("Cookie", theirOwner).type("form").send({ intent: "invite", email, role: "planner" });
    const [invite] = await getDb().select().from(invitations).where(eq(invitations.email, email));
    const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "revoke", invitationId: invite.id });
    expect(res.status).toBe(404);
    expect(await getDb().select().from(invitations).where(eq(invitations.id, invite.id))).toHaveLength(1);
  });

  it("team: the member list shows only this shop's people", async () => {
    const res = await request(server).get("/team").set("Cookie", owner);
    expect(res.text).toContain(mine.users.sawyer.email);
    expect(res.text).not.toContain(theirs.users.sawyer.email);
  });

  it("orders and customers: another shop's order, its files and its customer answer 404, and stay unchanged", async () => {
    const cat = await createCatalogue(theirs.id);
    const order = await createOrder(theirs.id, { customerId: cat.customer.id, eventDate: "2027-05-01", dueDate: "2027-04-20", notes: "" }, [
      { productId: cat.sign.id, quantity: 1, personalisation: ["Theirs"], notes: "", files: [] },
    ]);
    expect((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).status).toBe(404);
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "move").field("to", "confirmed")).status).toBe(404);
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "add-lines").field("line-0-product", cat.sign.id).field("line-0-quantity", "1")).status).toBe(400); // their product is not in my catalogue
    expect((await request(server).get(`/orders/${order.id}/files/${order.id}`).set("Cookie", owner)).status).toBe(404);
    expect((await request(server).get(`/customers/${cat.customer.id}`).set("Cookie", owner)).status).toBe(404);
    expect((await request(server).post(`/customers/${cat.customer.id}`).set("Cookie", owner).type("form").send({ name: "Mine now" })).status).toBe(404);
    const [row] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(row.status).toBe("draft");
    const [customer] = await getDb().select().from(customers).where(eq(customers.id, cat.customer.id));
    expect(customer.name).toBe("Ardent–Vasquez wedding");
    const list = await request(server).get("/api/orders").set("Cookie", owner);
    expect(list.body.rows.map((r: { id: string }) => r.id)).not.toContain(order.id);
  });

  it("catalogue: another shop's product answers 404 to read and write, and keeps its name and parts", async () => {
    const t = await import("../../db/schema");
    const [material] = await getDb().insert(t.materials).values({ shopId: theirs.id, name: "Their birch", kind: "plywood", thicknessUm: 6000 }).returning();
    const [product] = await getDb().insert(t.products).values({ shopId: theirs.id, name: "Their plaque", priceMinor: 1000 }).returning();
    await getDb().insert(t.productParts).values({ productId: product.id, materialId: material.id, name: "Plaque", lengthUm: 400_000, widthUm: 150_000 });
    expect((await request(server).get(`/catalogue/products/${product.id}`).set("Cookie", owner)).status).toBe(404);
    const parts = JSON.stringify([{ key: "a", name: "Mine", length: "100", width: "100", materialId: material.id, quantity: 1, grainLocked: false, process: "saw" }]);
    const res = await request(server).post(`/catalogue/products/${product.id}`).set("Cookie", owner).type("form").send({ name: "Mine now", price: "1", leadTime: "", parts });
    expect(res.status).toBe(404);
    const [after] = await getDb().select().from(t.products).where(eq(t.products.id, product.id));
    expect(after.name).toBe("Their plaque");
    expect(await getDb().select().from(t.productParts).where(eq(t.productParts.productId, product.id))).toHaveLength(1);
    expect((await request(server).get("/catalogue?q=Their").set("Cookie", owner)).text).not.toContain("Their plaque");
  });

  it("catalogue: another shop's material and stock panel answer 404 to every change", async () => {
    const t = await import("../../db/schema");
    const [material] = await getDb().insert(t.materials).values({ shopId: theirs.id, name: "Their MDF", kind: "mdf", thicknessUm: 6000 }).returning();
    const [panel] = await getDb().insert(t.stockPanels).values({ shopId: theirs.id, materialId: material.id, lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 2190, onHand: 5 }).returning();
    const post = (body: Record<string, string>) => request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send(body);
    const panelFields = { length: "100", width: "100", cost: "1", onHand: "1", grain: "none" };
    expect((await post({ intent: "edit-material", materialId: material.id, name: "Mine", kind: "mdf", thickness: "3", note: "" })).status).toBe(404);
    expect((await post({ intent: "remove-material", materialId: material.id })).status).toBe(404);
    expect((await post({ intent: "add-panel", materialId: material.id, ...panelFields })).status).toBe(404);
    expect((await post({ intent: "edit-panel", panelId: panel.id, ...panelFields })).status).toBe(404);
    expect((await post({ intent: "remove-panel", panelId: panel.id })).status).toBe(404);
    const [m] = await getDb().select().from(t.materials).where(eq(t.materials.id, material.id));
    expect(m.name).toBe("Their MDF");
    expect(await getDb().select().from(t.stockPanels).where(eq(t.stockPanels.materialId, material.id))).toEqual([panel]);
  });

  it("deposits: another shop's deposit cannot be refunded, asked or read, and an event naming the wrong shop changes nothing", async () => {
    const t = await import("../../db/schema");
    const { deliver, eventBody, payOnFake, retrieveSession } = await import("../support/payments");
    await getDb().update(t.shops).set({ depositRule: "percent", depositPercent: 50 }).where(eq(t.shops.id, theirs.id));
    const cat = await createCatalogue(theirs.id);
    const order = await createOrder(theirs.id, { customerId: cat.customer.id, eventDate: "2027-05-01", dueDate: "2027-04-20", notes: "" }, [
      { productId: cat.sign.id, quantity: 1, personalisation: [], notes: "", files: [] },
    ]);
    const theirOwner = await signIn(server, theirs.users.owner);
    await request(server).post(`/orders/${order.id}`).set("Cookie", theirOwner).field("intent", "move").field("to", "confirmed").field("deposit", "yes");
    const [deposit] = await getDb().select().from(t.deposits).where(eq(t.deposits.orderId, order.id));
    await payOnFake((await request(server).get(`/pay/${deposit.linkToken}/checkout`)).headers.location);
    const [withSession] = await getDb().select().from(t.deposits).where(eq(t.deposits.id, deposit.id));
    const session = await retrieveSession(withSession.checkoutSessionId!);

    // A signed event whose session names my shop for their deposit finds nothing to record.
    const misdirected = { ...session, metadata: { ...session.metadata, shopId: mine.id } };
    expect((await deliver(server, eventBody("checkout.session.completed", misdirected))).body.outcome).toBe("ignored");
    expect(await getDb().select().from(t.depositMoves).where(eq(t.depositMoves.depositId, deposit.id))).toEqual([]);

    expect((await deliver(server, eventBody("checkout.session.completed", session))).body.outcome).toBe("recorded");
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "refund-deposit")).status).toBe(404);
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "request-deposit")).status).toBe(404);
    const [after] = await getDb().select().from(t.deposits).where(eq(t.deposits.id, deposit.id));
    expect(after.status).toBe("paid");
    expect(await getDb().select().from(t.depositMoves).where(eq(t.depositMoves.depositId, deposit.id))).toHaveLength(1);
    const myBooks = await signIn(server, mine.users.bookkeeper);
    const ledger = await request(server).get("/ledger/deposits").set("Cookie", myBooks);
    expect(ledger.status).toBe(200);
    expect(ledger.text).not.toContain(order.id);
    // My shop asked no deposit: its CSV is the title line and the column names only.
    expect((await request(server).get("/ledger/deposits.csv").set("Cookie", myBooks)).text.trim().split("\r\n")).toHaveLength(2);
  });
});
