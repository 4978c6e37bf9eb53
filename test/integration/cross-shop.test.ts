// Ids from another shop answer 404 and change nothing (OWASP ASVS 4.0.3 V4.2.1; ASVS 5.0 V8.2.2, V8.4.1).
// Every route that takes an id gets a case here.
import { eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { invitations, users } from "../../db/schema";
import { appServer } from "../support/app";
import { createShop, signIn } from "../support/factories";
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
});
