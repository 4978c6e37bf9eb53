import { eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { invitations, passwordResets, users } from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, sessionCookie, signIn, TEST_PASSWORD } from "../support/factories";
import { linkIn, mailTo, waitForMail } from "../support/outbox";
import { getDb } from "~/db.server";
import { changeMember, LastOwnerError } from "~/models/team.server";

const server = await appServer();
const unique = () => Math.random().toString(36).slice(2, 10);
const pathOf = (link: string) => new URL(link).pathname;

describe("invitations through the fake SMTP server", () => {
  it("owner invites a sawyer; the link sets name and password, signs them in, and works only once", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    const email = `new-sawyer-${unique()}@shop.test`;
    const sent = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "invite", email, role: "sawyer" });
    expect(sent.status).toBe(200);
    expect(sent.text).toContain(`Invitation sent to ${email}`);

    const mail = await waitForMail(email);
    expect(mail.subject).toContain(shop.name);
    const [invite] = await getDb().select().from(invitations).where(eq(invitations.email, email));
    const until = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone: "UTC" }).format(invite.expiresAt);
    expect(mail.text).toContain(`The link works once and until ${until} UTC.`); // the shop's clock: a test shop is on UTC
    const link = linkIn(mail);
    expect(pathOf(link)).toMatch(/^\/invitation\/[A-Za-z0-9_-]{43}$/); // 32 random bytes

    const page = await request(server).get(pathOf(link));
    expect(page.status).toBe(200);
    expect(page.text).toContain("sawyer");

    const bad = await request(server).post(pathOf(link)).type("form").send({ name: "", password: "short", confirm: "short" });
    expect(bad.status).toBe(400);
    expect(bad.text).toContain("field-name-error");
    expect(bad.text).toContain("field-password-error");

    const accepted = await request(server).post(pathOf(link)).type("form").send({ name: "Mira Sawyer", password: "cut once measure twice", confirm: "cut once measure twice" });
    expect(accepted.status).toBe(302);
    const cookie = sessionCookie(accepted.headers["set-cookie"]);
    expect((await request(server).get("/saw").set("Cookie", cookie)).status).toBe(200);
    expect((await request(server).get("/team").set("Cookie", cookie)).status).toBe(403);
    const [row] = await getDb().select().from(users).where(eq(users.email, email));
    expect(row).toMatchObject({ shopId: shop.id, role: "sawyer", name: "Mira Sawyer" });

    const reuse = await request(server).post(pathOf(link)).type("form").send({ name: "Someone Else", password: "cut once measure twice", confirm: "cut once measure twice" });
    expect(reuse.status).toBe(410);
    expect((await request(server).get(pathOf(link))).text).toContain("no longer works");
  });

  it("an invitation expires after seven days", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    const email = `late-${unique()}@shop.test`;
    await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "invite", email, role: "planner" });
    const [invite] = await getDb().select().from(invitations).where(eq(invitations.email, email));
    const days = (invite.expiresAt.getTime() - invite.createdAt.getTime()) / 86_400_000;
    expect(days).toBeCloseTo(7, 2);
    await getDb().update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.id, invite.id));
    const link = linkIn(await waitForMail(email));
    const res = await request(server).post(pathOf(link)).type("form").send({ name: "Late", password: "cut once measure twice", confirm: "cut once measure twice" });
    expect(res.status).toBe(410);
  });

  it("refuses to invite an address that already has an account, naming the field", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "invite", email: shop.users.sawyer.email, role: "sawyer" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("field-email-error");
  });
});

describe("password reset through the fake SMTP server", () => {
  it("mails a one-hour, single-use link; the new password works and every old session ends", async () => {
    const shop = await createShop();
    const user = shop.users.planner;
    const oldSession = await signIn(server, user);
    const res = await request(server).post("/forgot-password").type("form").send({ email: user.email });
    expect(res.status).toBe(200);
    expect(res.text).toContain("If an account uses that address");

    const link = linkIn(await waitForMail(user.email));
    const [reset] = await getDb().select().from(passwordResets).where(eq(passwordResets.userId, user.id));
    expect((reset.expiresAt.getTime() - reset.createdAt.getTime()) / 60_000).toBeCloseTo(60, 1);

    const done = await request(server).post(pathOf(link)).type("form").send({ password: "a brand new long phrase", confirm: "a brand new long phrase" });
    expect(done.status).toBe(302);
    expect((await request(server).get("/batches").set("Cookie", oldSession)).status).toBe(302);
    await expect(signIn(server, { email: user.email, password: TEST_PASSWORD })).rejects.toThrow(/400/);
    await expect(signIn(server, { email: user.email, password: "a brand new long phrase" })).resolves.toBeTruthy();

    const again = await request(server).post(pathOf(link)).type("form").send({ password: "yet another long phrase", confirm: "yet another long phrase" });
    expect(again.status).toBe(410);
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const email = `nobody-${unique()}@shop.test`;
    const res = await request(server).post("/forgot-password").type("form").send({ email });
    expect(res.status).toBe(200);
    expect(res.text).toContain("If an account uses that address");
    await new Promise((r) => setTimeout(r, 300));
    expect(mailTo(email)).toHaveLength(0);
  });
});

describe("members and roles", () => {
  it("the owner changes a role and removes a member; the removed person's session ends", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    const bookkeeper = await signIn(server, shop.users.bookkeeper);
    const changed = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "role", memberId: shop.users.planner.id, role: "sawyer" });
    expect(changed.status).toBe(200);
    const [planner] = await getDb().select().from(users).where(eq(users.id, shop.users.planner.id));
    expect(planner.role).toBe("sawyer");
    // A member row's role list cannot offer a role that does not exist: such a form is refused above the page.
    const madeUp = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "role", memberId: shop.users.planner.id, role: "admiral" });
    expect(madeUp.status).toBe(400);
    expect(madeUp.text).toMatch(/role="alert"[^>]*>This form could not be read \(role: /);
    expect((await getDb().select().from(users).where(eq(users.id, shop.users.planner.id)))[0].role).toBe("sawyer");

    const removed = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "remove", memberId: shop.users.bookkeeper.id });
    expect(removed.status).toBe(200);
    expect((await request(server).get("/ledger").set("Cookie", bookkeeper)).status).toBe(302);
  });

  it("a shop always keeps at least one owner", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    // The page never lets the owner touch their own row (next test), so the rule is held by the model.
    await expect(changeMember(shop.id, shop.users.planner.id, shop.users.owner.id, "planner")).rejects.toBeInstanceOf(LastOwnerError);
    await expect(changeMember(shop.id, shop.users.planner.id, shop.users.owner.id, null)).rejects.toBeInstanceOf(LastOwnerError);
    // With a second owner, the first may be stepped down by the second.
    await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "role", memberId: shop.users.planner.id, role: "owner" });
    const second = await signIn(server, shop.users.planner);
    const stepDown = await request(server).post("/team").set("Cookie", second).type("form").send({ intent: "role", memberId: shop.users.owner.id, role: "planner" });
    expect(stepDown.status).toBe(200);
  });

  it("an owner cannot remove themself or change their own role, even beside a second owner, and their own row offers neither", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "role", memberId: shop.users.planner.id, role: "owner" });
    for (const change of [{ intent: "remove" }, { intent: "role", role: "sawyer" }]) {
      const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ ...change, memberId: shop.users.owner.id });
      expect(res.status).toBe(409);
      expect(visible(res.text)).toContain("You cannot change your own role or remove yourself from the shop. Another owner can do it for you.");
    }
    const [me] = await getDb().select().from(users).where(eq(users.id, shop.users.owner.id));
    expect(me.role).toBe("owner");
    const page = await request(server).get("/team").set("Cookie", owner); // still signed in
    expect(page.status).toBe(200);
    const row = (email: string) => {
      const start = page.text.indexOf(`data-member="${email}"`);
      return page.text.slice(start, page.text.indexOf("</li>", start));
    };
    expect(row(shop.users.owner.email)).not.toContain('name="intent"');
    expect(visible(row(shop.users.owner.email))).toContain("another owner can change your role or remove you");
    expect(row(shop.users.planner.email)).toContain('value="remove"');
    expect(row(shop.users.planner.email)).toContain('value="role"');
  });

  it("names the bad field of a team form", async () => {
    const shop = await createShop();
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server).post("/team").set("Cookie", owner).type("form").send({ intent: "invite", email: "nope", role: "wizard" });
    expect(res.status).toBe(400);
    expect(res.text).toContain("field-email-error");
  });
});
