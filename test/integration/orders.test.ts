import { count, eq, inArray } from "drizzle-orm";
import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import { batches, batchLines, customers, depositMoves, deposits, lineFiles, materials, orderEvents, orderLines, orders, products, users } from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { mailTo, waitForMail } from "../support/outbox";
import { getDb } from "~/db.server";
import { orderHistory } from "~/models/order-history.server";
import { createOrder, moveOrder } from "~/models/orders.server";

const server = await appServer();
const fixture = (name: string) => readFileSync(new URL(`../fixtures/${name}`, import.meta.url));
const PNG = Buffer.from("89504e470d0a1a0a0000000d4948445200000001000000010806000000", "hex");
const SVG = Buffer.from('<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><rect width="10" height="10"/></svg>');

function uploadedFiles(): string[] {
  const root = join(process.env.STOPWISE_DATA!, "uploads");
  try {
    return readdirSync(root, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => d.name);
  } catch {
    return [];
  }
}

let shop: TestShop;
let catalogue: Awaited<ReturnType<typeof createCatalogue>>;
let owner: string;

beforeAll(async () => {
  shop = await createShop("Orders");
  catalogue = await createCatalogue(shop.id);
  owner = await signIn(server, shop.users.owner);
});

const orderCount = async () => (await getDb().select({ n: count() }).from(orders).where(eq(orders.shopId, shop.id)))[0].n;
const newOrder = () => request(server).post("/orders/new").set("Cookie", owner);

describe("customers", () => {
  it("creates, finds by search, and edits a customer; bad fields are named and kept", async () => {
    const bad = await request(server).post("/customers/new").set("Cookie", owner).type("form").send({ name: "", email: "nope", phone: "call me" });
    expect(bad.status).toBe(400);
    for (const f of ["name", "email", "phone"]) expect(bad.text).toContain(`field-${f}-error`);
    expect(bad.text).toContain('value="call me"');

    const made = await request(server).post("/customers/new").set("Cookie", owner).type("form").send({ name: "Brindle & Bean café", email: "hello@brindle.example", phone: "+44 20 7946 0018", notes: "Menus" });
    expect(made.status).toBe(302);
    const id = made.headers.location.split("/").pop()!;
    const found = await request(server).get("/customers?q=brindle").set("Cookie", owner);
    expect(found.text).toContain("Brindle &amp; Bean café");
    const none = await request(server).get("/customers?q=zzzz-nobody").set("Cookie", owner);
    expect(none.text).toContain('No customer matches');

    const edited = await request(server).post(`/customers/${id}`).set("Cookie", owner).type("form").send({ name: "Brindle and Bean", email: "", phone: "", notes: "" });
    expect(edited.status).toBe(302);
    const [row] = await getDb().select().from(customers).where(eq(customers.id, id));
    expect(row.name).toBe("Brindle and Bean");
  });

  it("a search with a NUL character in it lists as without it, never a 500", async () => {
    for (const path of ["/orders", "/api/orders"]) expect((await request(server).get(`${path}?q=Ardent%00`).set("Cookie", owner)).status).toBe(200);
    const found = await request(server).get("/customers?q=Ardent%00").set("Cookie", owner);
    expect(found.status).toBe(200);
    expect(found.text).toContain("Ardent–Vasquez wedding");
  });

  it("a customer's page lists each of their orders with its own total", async () => {
    const customer = (await getDb().insert(customers).values({ shopId: shop.id, name: "Quill & Finch" }).returning())[0];
    const header = { customerId: customer.id, eventDate: "2027-02-20", dueDate: "2027-02-06", notes: "" };
    const line = (productId: string, quantity: number) => ({ productId, quantity, personalisation: [], notes: "", files: [] });
    await createOrder(shop.id, header, [line(catalogue.tableNumber.id, 3), line(catalogue.sign.id, 1)]);
    await createOrder(shop.id, { ...header, eventDate: "2027-03-06", dueDate: "2027-02-20" }, [line(catalogue.tableNumber.id, 2)]);
    const page = visible((await request(server).get(`/customers/${customer.id}`).set("Cookie", owner)).text);
    expect(page).toContain("€104.50"); // 3 × €6.50 + €85.00
    expect(page).toContain("€13.00"); // 2 × €6.50
    expect(page).not.toContain("€0.00");
  });

  it("a bookkeeper reads customers but cannot change them", async () => {
    const bookkeeper = await signIn(server, shop.users.bookkeeper);
    expect((await request(server).get(`/customers/${catalogue.customer.id}`).set("Cookie", bookkeeper)).status).toBe(200);
    expect((await request(server).post(`/customers/${catalogue.customer.id}`).set("Cookie", bookkeeper).type("form").send({ name: "X" })).status).toBe(403);
    expect((await request(server).post("/customers/new").set("Cookie", bookkeeper).type("form").send({ name: "X" })).status).toBe(403);
  });
});

describe("creating orders", () => {
  it("saves an order with typed personalisation; the due date defaults to the longest lead time before the event", async () => {
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.tableNumber.id)
      .field("line-0-quantity", "3")
      .field("line-0-texts", "Table 1\nTable 2\n\nTable 3\n")
      .field("line-1-product", catalogue.sign.id)
      .field("line-1-quantity", "1");
    expect(res.status).toBe(302);
    const [order] = await getDb().select().from(orders).where(eq(orders.id, res.headers.location.split("/").pop()!));
    expect(order.dueDate).toBe("2027-01-02"); // 14 days (welcome sign) before 16 January
    expect(order.status).toBe("draft");
    const lines = await getDb().select().from(orderLines).where(eq(orderLines.orderId, order.id));
    expect(lines.map((l) => l.personalisation).sort()).toEqual([[], ["Table 1", "Table 2", "Table 3"]]);
    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(page.text).toContain("€104.50"); // 3 × €6.50 + €85.00 (test shops keep the default currency, EUR)
  });

  it("reads a guest list CSV with a byte-order mark, semicolons and blank lines, from the chosen column, quantity following the rows", async () => {
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.placeCard.id)
      .field("line-0-followRows", "on")
      .field("line-0-csvHeader", "guest")
      .attach("line-0-csv", fixture("guests-bom-semicolon.csv"), { filename: "guests.csv", contentType: "text/csv" });
    expect(res.status).toBe(302);
    const [line] = await getDb().select().from(orderLines).where(eq(orderLines.orderId, res.headers.location.split("/").pop()!));
    expect(line.personalisation).toEqual(["Zoë Ardent", "Nguyễn Thảo", "Mateo Duarte"]);
    expect(line.quantity).toBe(3);
  });

  it("names a header that is not in the file, listing the ones that are", async () => {
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.placeCard.id)
      .field("line-0-followRows", "on")
      .field("line-0-csvHeader", "Name")
      .attach("line-0-csv", fixture("guests-bom-semicolon.csv"), { filename: "guests.csv" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("line-0-csvHeader-error");
    expect(res.text).toContain("No column is headed &quot;Name&quot;");
    expect(res.text).not.toContain("The quantity follows the texts, but there are none."); // the CSV is the one reason
  });

  it("refuses 2,001 rows, and saves nothing", async () => {
    const before = await orderCount();
    const csv = ["Guest", ...Array.from({ length: 2001 }, (_, i) => `Guest ${i + 1}`)].join("\n");
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.placeCard.id)
      .field("line-0-followRows", "on")
      .attach("line-0-csv", Buffer.from(csv), { filename: "big.csv" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("line-0-csv-error");
    expect(res.text).toContain("2,001 texts");
    expect(await orderCount()).toBe(before);
  });

  it("takes exactly 2,000 rows", async () => {
    const csv = ["Guest", ...Array.from({ length: 2000 }, (_, i) => `Guest ${i + 1}`)].join("\r\n");
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.placeCard.id)
      .field("line-0-followRows", "on")
      .attach("line-0-csv", Buffer.from(csv), { filename: "max.csv" });
    expect(res.status).toBe(302);
  });

  it("refuses a binary file renamed .csv", async () => {
    const before = await orderCount();
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-01-16")
      .field("line-0-product", catalogue.placeCard.id)
      .field("line-0-followRows", "on")
      .attach("line-0-csv", PNG, { filename: "guests.csv", contentType: "text/csv" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("is not a text CSV file in UTF-8");
    expect(await orderCount()).toBe(before);
  });

  it("names every bad field at once and keeps what was typed", async () => {
    const res = await newOrder()
      .field("customerId", "")
      .field("eventDate", "16/01/2027")
      .field("notes", "Barn venue")
      .field("line-0-product", catalogue.tableNumber.id)
      .field("line-0-quantity", "two")
      .field("line-1-product", "")
      .field("line-1-quantity", "4")
      .field("line-2-product", catalogue.tableNumber.id)
      .field("line-2-quantity", "3")
      .field("line-2-texts", "Table 1\nTable 2");
    expect(res.status).toBe(400);
    for (const f of ["customerId", "eventDate", "line-0-quantity", "line-1-product", "line-2-quantity"]) expect(res.text).toContain(`${f.startsWith("line") ? f : `field-${f}`}-error`);
    expect(res.text).toContain("3 items but 2 personalisation texts");
    expect(res.text).toContain('value="Barn venue"');
  });

  it("refuses a due date after the event", async () => {
    const res = await newOrder().field("customerId", catalogue.customer.id).field("eventDate", "2027-01-16").field("dueDate", "2027-01-20").field("line-0-product", catalogue.sign.id).field("line-0-quantity", "1");
    expect(res.status).toBe(400);
    expect(res.text).toContain("field-dueDate-error");
  });
});

describe("artwork", () => {
  it("stores SVG and PNG by content outside the web root, lists them, and serves them to the shop only, as attachments", async () => {
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-02-01")
      .field("line-0-product", catalogue.sign.id)
      .field("line-0-quantity", "1")
      .attach("line-0-files", SVG, { filename: "../../etc/logo.svg", contentType: "image/svg+xml" })
      .attach("line-0-files", PNG, { filename: "photo.png", contentType: "application/octet-stream" });
    expect(res.status).toBe(302);
    const orderId = res.headers.location.split("/").pop()!;
    const [line] = await getDb().select().from(orderLines).where(eq(orderLines.orderId, orderId));
    const files = await getDb().select().from(lineFiles).where(eq(lineFiles.orderLineId, line.id));
    expect(files.map((f) => [f.fileName, f.contentType]).sort()).toEqual([["logo.svg", "image/svg+xml"], ["photo.png", "image/png"]]);

    const svg = files.find((f) => f.fileName === "logo.svg")!;
    const download = await request(server).get(`/orders/${orderId}/files/${svg.id}`).set("Cookie", owner).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on("data", (c: Buffer) => chunks.push(c));
      r.on("end", () => cb(null, Buffer.concat(chunks)));
    });
    expect(download.status).toBe(200);
    expect(Buffer.compare(download.body as Buffer, SVG)).toBe(0);
    expect(download.headers["content-disposition"]).toMatch(/^attachment; filename="logo.svg"/);
    expect(download.headers["content-security-policy"]).toContain("sandbox");

    expect((await request(server).get(`/orders/${orderId}/files/${svg.id}`)).status).toBe(302);
    const other = await createShop("Other");
    const stranger = await signIn(server, other.users.owner);
    expect((await request(server).get(`/orders/${orderId}/files/${svg.id}`).set("Cookie", stranger)).status).toBe(404);
  });

  it("refuses a text file named .png, naming the field, and keeps no file", async () => {
    const before = uploadedFiles().length;
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-02-01")
      .field("line-0-product", catalogue.sign.id)
      .field("line-0-quantity", "1")
      .attach("line-0-files", Buffer.from("just some text"), { filename: "logo.png", contentType: "image/png" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("line-0-files-error");
    expect(res.text).toContain("is not an SVG, PNG or PDF file");
    expect(uploadedFiles().length).toBe(before);
  });

  it("refuses artwork over 10 MB", async () => {
    const big = Buffer.concat([PNG, Buffer.alloc(10 * 1024 * 1024)]);
    const res = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-02-01")
      .field("line-0-product", catalogue.sign.id)
      .field("line-0-quantity", "1")
      .attach("line-0-files", big, { filename: "huge.png" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("larger than 10 MB");
  });

  it("a save that fails in the database after the files were stored leaves no orphan files or rows", async () => {
    const other = await createShop("Elsewhere");
    const strangerCustomer = (await createCatalogue(other.id)).customer;
    const before = { files: uploadedFiles().length, orders: await orderCount() };
    const res = await newOrder()
      .field("customerId", strangerCustomer.id) // another shop's customer: refused inside the transaction
      .field("eventDate", "2027-02-01")
      .field("line-0-product", catalogue.sign.id)
      .field("line-0-quantity", "1")
      .attach("line-0-files", PNG, { filename: "logo.png" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("That customer is not in this shop");
    expect(uploadedFiles().length).toBe(before.files);
    expect(await orderCount()).toBe(before.orders);
  });
});

describe("confirming", () => {
  async function draftOrder(customerId = catalogue.customer.id) {
    return createOrder(shop.id, { customerId, eventDate: "2027-01-16", dueDate: "2027-01-02", notes: "" }, [
      { productId: catalogue.tableNumber.id, quantity: 18, personalisation: [], notes: "", files: [] },
      { productId: catalogue.sign.id, quantity: 1, personalisation: [], notes: "", files: [] },
    ]);
  }
  const move = (orderId: string, to: string, cookie = owner) => request(server).post(`/orders/${orderId}`).set("Cookie", cookie).field("intent", "move").field("to", to);

  it("e-mails the customer the items, dates and total once, and shows that it was sent; a second confirm changes nothing", async () => {
    const order = await draftOrder();
    const seen = mailTo(catalogue.customer.email).length;
    expect((await move(order.id, "confirmed")).status).toBe(302);
    const mail = await waitForMail(catalogue.customer.email, seen);
    expect(mail.subject).toBe(`Your order #${order.number} with ${shop.name} is confirmed`);
    expect(mail.text).toContain("18 × Table number");
    expect(mail.text).toContain("€117.00"); // 18 × €6.50
    expect(mail.text).toMatch(/Total\s+€202\.00/); // + €85.00
    expect(mail.text).toContain("Event date: Sat, 16 Jan 2027");
    expect(mail.text).toContain("Ready by:   Sat, 2 Jan 2027");
    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(visible(page.text)).toContain(`Confirmation e-mailed to ${catalogue.customer.email}`);

    const again = await move(order.id, "confirmed");
    expect(again.status).toBe(409);
    expect(again.text).toContain("cannot become confirmed");
    await new Promise((r) => setTimeout(r, 300));
    expect(mailTo(catalogue.customer.email).length).toBe(seen + 1);
  });

  it("shows a failed send and sends it on retry without confirming twice", async () => {
    const [noEmail] = await getDb().insert(customers).values({ shopId: shop.id, name: "Nursery, no e-mail yet", email: "" }).returning();
    const order = await draftOrder(noEmail.id);
    await move(order.id, "confirmed");
    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(page.text).toContain("The customer has no e-mail address");
    expect(page.text).toContain("Send the confirmation again");

    const address = `nursery-${Math.random().toString(36).slice(2)}@example.com`;
    await getDb().update(customers).set({ email: address }).where(eq(customers.id, noEmail.id));
    const [{ confirmedAt }] = await getDb().select({ confirmedAt: orders.confirmedAt }).from(orders).where(eq(orders.id, order.id));
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "resend")).status).toBe(302);
    await waitForMail(address);
    const [after] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(after.confirmationSentAt).not.toBeNull();
    expect(after.confirmationError).toBeNull();
    expect(after.confirmedAt).toEqual(confirmedAt);
    const resendAgain = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "resend");
    expect(resendAgain.status).toBe(409);
  });

  it("moves through production to delivery, and refuses a jump", async () => {
    const order = await draftOrder();
    expect((await move(order.id, "ready")).status).toBe(409);
    for (const to of ["confirmed", "in_production", "ready", "delivered"]) expect((await move(order.id, to)).status).toBe(302);
    const [row] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(row.status).toBe("delivered");
    const late = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "add-lines").field("line-0-product", catalogue.sign.id).field("line-0-quantity", "1");
    expect(late.status).toBe(409);
  });

  it("tells the customer a ready order is ready, with what is still to pay after the deposit, and shows when it went", async () => {
    const order = await draftOrder();
    const tell = (cookie = owner) => request(server).post(`/orders/${order.id}`).set("Cookie", cookie).field("intent", "ready-notice");
    await move(order.id, "confirmed");
    const early = await tell();
    expect(early.status).toBe(409);
    expect(early.text).toContain("Only an order marked ready can be announced as ready.");
    for (const to of ["in_production", "ready"]) await move(order.id, to);
    // €60.00 of the €202.00 paid as a deposit
    const [deposit] = await getDb().insert(deposits).values({ shopId: shop.id, orderId: order.id, amountMinor: 6000, currency: "EUR", linkToken: `ready-${order.id}`, status: "paid" }).returning();
    await getDb().insert(depositMoves).values({ shopId: shop.id, depositId: deposit.id, kind: "payment", amountMinor: 6000, currency: "EUR", providerRef: `pi_ready_${order.id}`, occurredAt: new Date() });
    const before = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(visible(before.text)).toContain("The customer has not been told it is ready.");
    expect(visible(before.text)).toContain("E-mail the customer it is ready");

    const bookkeeper = await signIn(server, shop.users.bookkeeper);
    expect((await tell(bookkeeper)).status).toBe(403);
    const seen = mailTo(catalogue.customer.email).length;
    const told = await tell();
    expect(told.status).toBe(200);
    expect(visible(told.text)).toContain(`${catalogue.customer.email} was told the order is ready.`);
    const mail = await waitForMail(catalogue.customer.email, seen);
    expect(mail.subject).toBe(`Your order #${order.number} with ${shop.name} is ready`);
    expect(mail.text).toContain("in good time for your event on Sat, 16 Jan 2027");
    expect(mail.text).toContain("Still to pay: €142.00."); // €202.00 less the €60.00 deposit
    const [row] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(row.readyNoticeSentAt).not.toBeNull();
    const after = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(visible(after.text)).toContain(`The customer was told it is ready: e-mailed to ${catalogue.customer.email}`);
    expect(visible(after.text)).toContain("E-mail it again");
  });

  it("cannot tell a customer without an e-mail address that the order is ready, and says so", async () => {
    const [noEmail] = await getDb().insert(customers).values({ shopId: shop.id, name: "Walk-in, no e-mail", email: "" }).returning();
    const order = await draftOrder(noEmail.id);
    for (const to of ["confirmed", "in_production", "ready"]) await move(order.id, to);
    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(visible(page.text)).toContain("The customer has no e-mail address to tell them it is ready.");
    expect(visible(page.text)).not.toContain("E-mail the customer it is ready");
    const refused = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "ready-notice");
    expect(refused.status).toBe(409);
    expect(refused.text).toContain("The customer has no e-mail address; add one to the customer first.");
    const [row] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(row.readyNoticeSentAt).toBeNull();
  });

  it("a sawyer cannot edit orders; a bookkeeper reads them but cannot confirm", async () => {
    const order = await draftOrder();
    const sawyer = await signIn(server, shop.users.sawyer);
    const bookkeeper = await signIn(server, shop.users.bookkeeper);
    expect((await request(server).get(`/orders/${order.id}`).set("Cookie", sawyer)).status).toBe(403);
    expect((await move(order.id, "confirmed", sawyer)).status).toBe(403);
    expect((await request(server).get(`/orders/${order.id}`).set("Cookie", bookkeeper)).status).toBe(200);
    expect((await move(order.id, "confirmed", bookkeeper)).status).toBe(403);
    const [row] = await getDb().select().from(orders).where(eq(orders.id, order.id));
    expect(row.status).toBe("draft");
  });
});

describe("editing lines", () => {
  it("adds a line with artwork and removes it again, deleting its stored file", async () => {
    const order = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: "2027-03-01", dueDate: "2027-02-20", notes: "" }, [
      { productId: catalogue.sign.id, quantity: 1, personalisation: [], notes: "", files: [] },
    ]);
    const before = uploadedFiles().length;
    const added = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "add-lines").field("line-0-product", catalogue.tableNumber.id).field("line-0-quantity", "2").attach("line-0-files", PNG, { filename: "n.png" });
    expect(added.status).toBe(302);
    expect(uploadedFiles().length).toBe(before + 1);
    const lines = await getDb().select().from(orderLines).where(eq(orderLines.orderId, order.id));
    const line = lines.find((l) => l.productId === catalogue.tableNumber.id)!;
    const removed = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "remove-line").field("lineId", line.id);
    expect(removed.status).toBe(302);
    expect(uploadedFiles().length).toBe(before);
  });
});

describe("correcting personalisation texts", () => {
  it("puts right a misspelt name on a line, one text per item, refusing a wrong count and a line whose batch is at the saw", async () => {
    const order = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: "2027-03-01", dueDate: "2027-02-20", notes: "" }, [
      { productId: catalogue.tableNumber.id, quantity: 3, personalisation: ["Table 1", "Tabel 2", "Table 3"], notes: "", files: [] },
    ]);
    const [line] = await getDb().select().from(orderLines).where(eq(orderLines.orderId, order.id));
    const texts = (value: string, cookie = owner) => request(server).post(`/orders/${order.id}`).set("Cookie", cookie).field("intent", "line-texts").field("lineId", line.id).field("texts", value);
    const stored = async () => (await getDb().select().from(orderLines).where(eq(orderLines.id, line.id)))[0].personalisation;

    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(visible(page.text)).toContain("Correct the texts");
    const short = await texts("Table 1\nTable 2");
    expect(short.status).toBe(400);
    expect(visible(short.text)).toContain("Texts: this line has 3 items but 2 texts were given; one text per item, or none.");
    expect(visible(short.text)).toContain("Table 1\nTable 2"); // what was typed stays in the box
    expect(await stored()).toEqual(["Table 1", "Tabel 2", "Table 3"]);
    expect((await texts("Table 1\nTable 2\nTable 3", await signIn(server, shop.users.sawyer))).status).toBe(403);

    expect((await texts(" Table 1 \r\nTable 2\n\nTable 3\n")).status).toBe(302);
    expect(await stored()).toEqual(["Table 1", "Table 2", "Table 3"]);

    // Once the line's batch is at the saw, its labels may be printed: the texts stay as they are.
    const [birch] = await getDb().select().from(materials).where(eq(materials.shopId, shop.id));
    const [batch] = await getDb().insert(batches).values({ shopId: shop.id, number: 9001, materialId: birch.id, dueBy: "2027-02-20", status: "released" }).returning();
    await getDb().insert(batchLines).values({ batchId: batch.id, orderLineId: line.id, materialId: birch.id });
    const late = await texts("Table One\nTable Two\nTable Three");
    expect(late.status).toBe(409);
    expect(visible(late.text)).toContain("This line is in batch B-9001, which has gone to the saw; its texts no longer change.");
    expect(await stored()).toEqual(["Table 1", "Table 2", "Table 3"]);
  });
});

describe("the order list", () => {
  it("sorts, filters and pages on the server, as JSON for the client and as HTML before scripts", async () => {
    const busy = await createShop("Busy");
    const cat = await createCatalogue(busy.id);
    for (let i = 0; i < 30; i++) {
      await createOrder(busy.id, { customerId: cat.customer.id, eventDate: `2027-04-${String((i % 28) + 1).padStart(2, "0")}`, dueDate: "2027-03-01", notes: "" }, [
        { productId: cat.tableNumber.id, quantity: i + 1, personalisation: [], notes: "", files: [] },
      ]);
    }
    const cookie = await signIn(server, busy.users.bookkeeper);
    const page2 = await request(server).get("/api/orders?size=25&page=2&sort=total&dir=desc").set("Cookie", cookie);
    expect(page2.status).toBe(200);
    expect(page2.body.total).toBe(30);
    expect(page2.body.rows).toHaveLength(5);
    expect(page2.body.rows.map((r: { totalMinor: number }) => r.totalMinor)).toEqual([5, 4, 3, 2, 1].map((q) => q * 650));

    const byNumber = await request(server).get(`/api/orders?q=${1001 + 7}`).set("Cookie", cookie);
    expect(byNumber.body.rows.map((r: { number: number }) => r.number)).toEqual([1008]);
    const drafts = await request(server).get("/api/orders?status=confirmed").set("Cookie", cookie);
    expect(drafts.body.total).toBe(0);
    const junk = await request(server).get("/api/orders?sort=;drop table orders&size=9999&page=-3").set("Cookie", cookie);
    expect(junk.status).toBe(200);
    expect(junk.body.query).toMatchObject({ sort: "due", size: 25, page: 1 });

    const html = await request(server).get("/orders?sort=number&dir=asc").set("Cookie", cookie);
    expect(visible(html.text)).toContain("#1001<");
    expect(html.text).toContain("1–25 of 30");
  });
});

describe("finding an order by a personalisation text", () => {
  it("a guest's name finds their order, says which text matched, and finds nothing in another shop", async () => {
    const mine = await createShop("Texts");
    const cat = await createCatalogue(mine.id);
    const line = (texts: string[]) => ({ productId: cat.tableNumber.id, quantity: texts.length, personalisation: texts, notes: "", files: [] });
    const wedding = await createOrder(mine.id, { customerId: cat.customer.id, eventDate: "2027-06-05", dueDate: "2027-05-20", notes: "" }, [line(["Table 1", "Zoë Ardent", "Anh 100% Ardent"])]);
    await createOrder(mine.id, { customerId: cat.customer.id, eventDate: "2027-06-12", dueDate: "2027-05-27", notes: "" }, [line(["Table 9"])]);
    const theirs = await createShop("Texts elsewhere");
    const theirCat = await createCatalogue(theirs.id);
    await createOrder(theirs.id, { customerId: theirCat.customer.id, eventDate: "2027-06-05", dueDate: "2027-05-20", notes: "" }, [{ ...line(["Zoë Ardent"]), productId: theirCat.tableNumber.id }]);

    const cookie = await signIn(server, mine.users.owner);
    const find = async (q: string) => (await request(server).get(`/api/orders?q=${encodeURIComponent(q)}`).set("Cookie", cookie)).body.rows as { id: string; matched: string | null }[];
    expect(await find("zoë")).toEqual([expect.objectContaining({ id: wedding.id, matched: "Zoë Ardent" })]);
    expect(await find("100%")).toEqual([expect.objectContaining({ id: wedding.id, matched: "Anh 100% Ardent" })]); // % is a character, not a wildcard
    expect(await find("10_%")).toEqual([]);
    expect(await find("Guest list of nobody")).toEqual([]);
    // Without a search nothing is marked as matched.
    expect((await find("")).map((r) => r.matched)).toEqual([null, null]);
    const html = (await request(server).get("/orders?q=zo%C3%AB").set("Cookie", cookie)).text;
    expect(visible(html)).toContain("Text: “Zoë Ardent”");
  });
});

describe("an order's history", () => {
  it("tells who did what to the order, newest first, and nothing of a refused or empty change", async () => {
    const made = await newOrder()
      .field("customerId", catalogue.customer.id)
      .field("eventDate", "2027-04-17")
      .field("dueDate", "2027-04-03")
      .field("line-0-product", catalogue.tableNumber.id)
      .field("line-0-quantity", "2")
      .field("line-0-texts", "Tabel 1\nTable 2");
    expect(made.status).toBe(302);
    const orderId = made.headers.location.split("/").pop()!;
    const post = (fields: Record<string, string>) => {
      let req = request(server).post(`/orders/${orderId}`).set("Cookie", owner);
      for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
      return req;
    };
    const events = async () => (await getDb().select().from(orderEvents).where(eq(orderEvents.orderId, orderId))).length;
    const header = { intent: "header", customerId: catalogue.customer.id, eventDate: "2027-04-24", dueDate: "2027-04-03", notes: "Gold leaf on table 1" };
    expect((await post(header)).status).toBe(302);
    expect((await post(header)).status).toBe(302); // saved again unchanged: no entry
    expect((await post({ intent: "add-lines", "line-0-product": catalogue.sign.id, "line-0-quantity": "1" })).status).toBe(302);
    const lines = await getDb().select().from(orderLines).where(eq(orderLines.orderId, orderId));
    const numbers = lines.find((l) => l.productId === catalogue.tableNumber.id)!;
    const sign = lines.find((l) => l.productId === catalogue.sign.id)!;
    const before = await events();
    expect((await post({ intent: "line-texts", lineId: numbers.id, texts: "Table 1" })).status).toBe(400); // wrong count: refused, untold
    expect((await post({ intent: "move", to: "ready" })).status).toBe(409); // a jump: refused, untold
    expect(await events()).toBe(before);
    expect((await post({ intent: "line-texts", lineId: numbers.id, texts: "Table 1\nTable 2" })).status).toBe(302);
    expect((await post({ intent: "line-texts", lineId: numbers.id, texts: "Table 1\nTable 2" })).status).toBe(302); // the same texts: no entry
    expect((await post({ intent: "remove-line", lineId: sign.id })).status).toBe(302);
    const seen = mailTo(catalogue.customer.email).length;
    expect((await post({ intent: "move", to: "confirmed" })).status).toBe(302);
    await waitForMail(catalogue.customer.email, seen);

    const ownerName = `owner ${shop.name.split(" ").pop()}`;
    const expected = [
      `The confirmation was e-mailed to ${catalogue.customer.email} · ${ownerName}`,
      `Confirmed the order · ${ownerName}`,
      `Removed 1 × ${catalogue.sign.name} · ${ownerName}`,
      `Corrected the texts of ${catalogue.tableNumber.name} (2 texts) · ${ownerName}`,
      `Added 1 × ${catalogue.sign.name} · ${ownerName}`,
      `Changed the event date from Sat, 17 Apr 2027 to Sat, 24 Apr 2027; the notes from none to “Gold leaf on table 1” · ${ownerName}`,
      `Took the order, with 1 line · ${ownerName}`,
    ];
    expect(await events()).toBe(expected.length);
    // The bookkeeper reads it too: newest first, each entry once.
    const html = (await request(server).get(`/orders/${orderId}`).set("Cookie", await signIn(server, shop.users.bookkeeper))).text;
    const page = visible(html).replace(/<[^>]+>/g, ""); // the words as read
    expect(page).toContain(`History (${expected.length})`);
    const at = expected.map((line) => page.indexOf(line));
    expect(at.every((i) => i >= 0), `missing: ${expected.filter((_, k) => at[k] < 0).join(" | ")}`).toBe(true);
    expect(at).toEqual([...at].sort((a, b) => a - b));
    expect(page).toMatch(/\d{1,2} \w{3} \d{4}, \d{2}:\d{2} UTC/);
  });

  it("a member who leaves the shop leaves the entries, without a name", async () => {
    const order = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: "2027-05-01", dueDate: "2027-04-20", notes: "" }, [
      { productId: catalogue.sign.id, quantity: 1, personalisation: [], notes: "", files: [] },
    ]);
    const [gone] = await getDb().insert(users).values({ id: `gone-${order.id.slice(0, 8)}`, shopId: shop.id, email: `gone-${order.id.slice(0, 8)}@example.com`, name: "Former Planner", role: "owner", passwordHash: "x" }).returning();
    await moveOrder(shop.id, order.id, "confirmed", { by: gone.id });
    expect(await orderHistory(shop.id, order.id)).toEqual([expect.objectContaining({ text: "Took the order, with 1 line", actor: null }), expect.objectContaining({ text: "Confirmed the order", actor: "Former Planner" })]);
    await getDb().delete(users).where(eq(users.id, gone.id));
    expect((await orderHistory(shop.id, order.id)).map((e) => [e.text, e.actor])).toEqual([
      ["Took the order, with 1 line", null],
      ["Confirmed the order", null],
    ]);
    // Another shop reads none of it.
    const other = await createShop("Other history");
    expect(await orderHistory(other.id, order.id)).toEqual([]);
  });
});

describe("ordering again", () => {
  it("makes a new draft for the same customer and lines at today's prices, due by lead time, leaving out what is no longer offered", async () => {
    const cat = await createCatalogue(shop.id);
    const first = await createOrder(shop.id, { customerId: cat.customer.id, eventDate: "2027-01-16", dueDate: "2027-01-02", notes: "Barn venue" }, [
      { productId: cat.tableNumber.id, quantity: 2, personalisation: ["Breakfast", "Lunch"], notes: "gold ink", files: [] },
      { productId: cat.sign.id, quantity: 1, personalisation: [], notes: "", files: [] },
      { productId: cat.placeCard.id, quantity: 1, personalisation: ["Ana"], notes: "", files: [] },
    ]);
    await getDb().update(products).set({ priceMinor: 700 }).where(eq(products.id, cat.tableNumber.id));
    await getDb().update(products).set({ retiredAt: new Date() }).where(eq(products.id, cat.placeCard.id));
    const again = (fields: Record<string, string>) => {
      let req = request(server).post(`/orders/${first.id}`).set("Cookie", owner).field("intent", "repeat");
      for (const [k, val] of Object.entries(fields)) req = req.field(k, val);
      return req;
    };
    const count = await orderCount();
    const bad = await again({ repeatEventDate: "next spring" });
    expect(bad.status).toBe(400);
    expect(visible(bad.text)).toContain("Enter the new event's date as a date, like 2027-01-16.");
    expect(bad.text).toContain('id="field-repeatEventDate-error"');
    expect(await orderCount()).toBe(count);

    const made = await again({ repeatEventDate: "2028-01-15", repeatTexts: "yes" });
    expect(made.status).toBe(302);
    const id = made.headers.location.split("/").pop()!;
    expect(id).not.toBe(first.id);
    const [order] = await getDb().select().from(orders).where(eq(orders.id, id));
    expect(order).toMatchObject({ customerId: cat.customer.id, eventDate: "2028-01-15", dueDate: "2028-01-01", status: "draft", notes: "" }); // the sign's 14 days
    const lines = await getDb().select().from(orderLines).where(eq(orderLines.orderId, id));
    expect(lines.map((l) => [l.productId, l.quantity, l.unitPriceMinor, l.personalisation, l.notes]).sort()).toEqual(
      [
        [cat.sign.id, 1, 8500, [], ""],
        [cat.tableNumber.id, 2, 700, ["Breakfast", "Lunch"], "gold ink"],
      ].sort(),
    );
    expect((await orderHistory(shop.id, id)).map((e) => e.text)).toEqual([`Took the order, with 2 lines, repeating #${(await getDb().select().from(orders).where(eq(orders.id, first.id)))[0].number}; left out Place card, no longer offered`]);

    const bare = await again({ repeatEventDate: "2028-02-12" });
    const bareLines = await getDb().select().from(orderLines).where(eq(orderLines.orderId, bare.headers.location.split("/").pop()!));
    expect(bareLines.every((l) => l.personalisation.length === 0)).toBe(true); // texts not asked for

    await getDb().update(products).set({ retiredAt: new Date() }).where(inArray(products.id, [cat.sign.id, cat.tableNumber.id]));
    const none = await again({ repeatEventDate: "2028-03-11" });
    expect(none.status).toBe(409);
    expect(visible(none.text)).toContain("None of this order's products is offered any more");
    expect((await request(server).post(`/orders/${first.id}`).set("Cookie", await signIn(server, shop.users.bookkeeper)).field("intent", "repeat").field("repeatEventDate", "2028-01-15")).status).toBe(403);
  });
});

describe("the handover checklist", () => {
  it("prints every item by its text with a box to tick, and what is still to pay for those who see deposits", async () => {
    const guests = Array.from({ length: 60 }, (_, i) => (i === 41 ? "Nguyễn Thảo" : `Guest ${i + 1}`));
    const order = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: "2027-06-05", dueDate: "2027-05-22", notes: "" }, [
      { productId: catalogue.tableNumber.id, quantity: 60, personalisation: guests, notes: "", files: [] },
      { productId: catalogue.sign.id, quantity: 2, personalisation: [], notes: "", files: [] },
    ]);
    await moveOrder(shop.id, order.id, "confirmed");
    const work = mkdtempSync(join(tmpdir(), "checklist-"));
    const pdfText = async (cookie: string, query = "") => {
      const res = await request(server).get(`/orders/${order.id}/checklist${query}`).set("Cookie", cookie).buffer(true).parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on("data", (c: Buffer) => chunks.push(c));
        r.on("end", () => done(null, Buffer.concat(chunks)));
      });
      expect(res.status).toBe(200);
      expect(res.headers["content-type"]).toBe("application/pdf");
      const file = join(work, `c${Math.random().toString(36).slice(2)}.pdf`);
      writeFileSync(file, res.body as Buffer);
      return execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    };
    const text = await pdfText(owner);
    expect(text).toContain(`Order #${order.number} · handover checklist`);
    for (const guest of guests) expect(text).toContain(`${guests.indexOf(guest) + 1}. ${guest}`);
    expect(text).toContain("60 × Table number");
    expect(text).toContain("2 × Welcome sign");
    expect(text).toContain("counted ____ of 2");
    expect(text).toContain("still to pay €560.00"); // 60 × €6.50 + 2 × €85.00, no deposit
    expect(text).toContain("(continued)"); // 60 names run onto a second page
    const planner = await pdfText(await signIn(server, shop.users.planner), "?paper=letter");
    expect(planner).toContain("Guest 60");
    expect(planner).not.toContain("still to pay");
    expect((await request(server).get(`/orders/${order.id}/checklist?paper=a3`).set("Cookie", owner)).status).toBe(400);
    const page = await request(server).get(`/orders/${order.id}`).set("Cookie", owner);
    expect(page.text).toContain(`href="/orders/${order.id}/checklist"`);
  });
});
