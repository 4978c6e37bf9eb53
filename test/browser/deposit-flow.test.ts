import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { startPaymentsFake, type PaymentsFake } from "../fakes/payments";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { linkIn, mailTo, waitForMail } from "../support/outbox";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { createOrder } from "~/models/orders.server";

// The whole deposit in chromium: the owner confirms, the customer follows the e-mailed link, pays on
// the fake payment service's page, its signed webhook reaches the app, and the order shows it paid.
// This test runs its own fake so the webhook goes to the app it starts.
describe("a customer pays the deposit of the wedding order", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let fake: PaymentsFake;
  let browser: Browser;
  let shop: TestShop;
  let orderId: string;
  let email: string;
  beforeAll(async () => {
    shop = await createShop("Deposit flow");
    await getDb().update(t.shops).set({ depositRule: "percent", depositPercent: 30 }).where(eq(t.shops.id, shop.id));
    const cat = await createCatalogue(shop.id);
    email = cat.customer.email;
    const order = await createOrder(shop.id, { customerId: cat.customer.id, eventDate: "2027-01-16", dueDate: "2027-01-02", notes: "" }, [
      { productId: cat.sign.id, quantity: 1, personalisation: ["Welcome to the wedding of Celia & Marco"], notes: "", files: [] },
      { productId: cat.tableNumber.id, quantity: 18, personalisation: [], notes: "", files: [] },
      { productId: cat.placeCard.id, quantity: 120, personalisation: [], notes: "", files: [] },
    ]);
    orderId = order.id;
    fake = await startPaymentsFake({ secretKey: process.env.STRIPE_SECRET_KEY!, webhookSecret: process.env.STRIPE_WEBHOOK_SECRET! });
    app = await startApp({ STRIPE_API_PORT: String(fake.port) });
    fake.webhookUrl = `${app.url}/webhooks/payments`;
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
    await fake?.stop();
  });

  it("owner confirms with the deposit, the customer pays on the payment page, and the order shows it paid", async () => {
    const ownerPage = await browser.newPage({ viewport: VIEWPORTS.desktop });
    const errors: string[] = [];
    ownerPage.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(ownerPage, app.url, shop.users.owner, `/orders/${orderId}`);
    await ownerPage.getByLabel(/Ask a deposit of €125\.40/).waitFor(); // 30 % of €418.00
    expect(await ownerPage.getByLabel(/Ask a deposit of/).isChecked()).toBe(true);
    const seen = mailTo(email).length;
    await ownerPage.getByRole("button", { name: "Confirm and e-mail the customer" }).click();
    await ownerPage.getByTestId("deposit-status").getByText("Deposit requested").waitFor();
    expect(await ownerPage.getByTestId("balance-due").textContent()).toBe("€418.00");

    // The customer, in a browser of their own with no Stopwise session.
    const mail = await waitForMail(email, seen);
    expect(mail.text).toContain("we ask a deposit of €125.40");
    const customer = await (await browser.newContext({ viewport: VIEWPORTS.phone })).newPage();
    customer.on("pageerror", (err) => errors.push(err.message));
    await customer.goto(linkIn(mail));
    await customer.getByRole("heading", { name: /^Deposit for order #\d+$/ }).waitFor();
    await customer.getByRole("link", { name: "Pay €125.40 now" }).click();
    await customer.waitForURL((url) => url.port === String(fake.port));
    await customer.getByText("Local test payment page").waitFor();
    await customer.getByRole("button", { name: "Pay €125.40" }).click();
    await customer.waitForURL((url) => url.origin === app.url && url.searchParams.has("session"));
    await customer.getByText("Thank you: your deposit of €125.40 is paid.").waitFor();

    // The signed webhook reached the app before the customer came back.
    const delivered = fake.events.find((e) => e.type === "checkout.session.completed");
    expect(delivered?.delivered).toBe(200);
    await ownerPage.reload();
    await ownerPage.getByTestId("deposit-status").getByText("Deposit paid").waitFor();
    expect(await ownerPage.getByTestId("balance-due").textContent()).toBe("€292.60");

    // Delivered a second time, the same event changes nothing.
    const again = fake.signed(delivered!.id);
    const res = await fetch(`${app.url}/webhooks/payments`, { method: "POST", headers: { "Content-Type": "application/json", "Stripe-Signature": again.signature }, body: again.body });
    expect(await res.json()).toEqual({ received: true, outcome: "duplicate" });
    const [deposit] = await getDb().select().from(t.deposits).where(eq(t.deposits.orderId, orderId));
    expect(await getDb().select().from(t.depositMoves).where(eq(t.depositMoves.depositId, deposit.id))).toHaveLength(1);

    // The owner refunds it; the payment service's refund event finds it already recorded.
    await ownerPage.getByText("Refund the deposit…").click();
    await ownerPage.getByRole("button", { name: "Refund €125.40" }).click();
    await ownerPage.getByTestId("deposit-status").getByText("Deposit refunded").waitFor();
    expect(await ownerPage.getByTestId("balance-due").textContent()).toBe("€418.00");
    await expect.poll(() => fake.events.find((e) => e.type === "refund.created")?.delivered).toBe(200);
    expect(await getDb().select().from(t.depositMoves).where(eq(t.depositMoves.depositId, deposit.id))).toHaveLength(2);
    expect(errors).toEqual([]);
  });
});
