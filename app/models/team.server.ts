import { and, asc, count, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { invitations, users } from "../../db/schema";
import { getDb } from "~/db.server";
import type { Role } from "~/lib/permissions";
import { INVITATION_LIFETIME_MS, newToken } from "~/tokens.server";

export class LastOwnerError extends Error {
  constructor() {
    super("A shop always keeps at least one owner: make someone else owner first.");
  }
}

/** Nobody changes their own membership: removing oneself would end one's own session mid-page. */
export class OwnMembershipError extends Error {
  constructor() {
    super("You cannot change your own role or remove yourself from the shop. Another owner can do it for you.");
  }
}

export async function listMembers(shopId: string) {
  return getDb()
    .select({ id: users.id, name: users.name, email: users.email, role: users.role, createdAt: users.createdAt })
    .from(users)
    .where(eq(users.shopId, shopId))
    .orderBy(asc(users.name));
}

export async function listOpenInvitations(shopId: string) {
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(and(eq(invitations.shopId, shopId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
    .orderBy(desc(invitations.createdAt));
}

export async function emailInUse(email: string): Promise<boolean> {
  const [row] = await getDb().select({ n: count() }).from(users).where(eq(sql`lower(${users.email})`, email.toLowerCase()));
  return row.n > 0;
}

export async function createInvitation(shopId: string, invitedBy: string, email: string, role: Role) {
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + INVITATION_LIFETIME_MS);
  const [row] = await getDb()
    .insert(invitations)
    .values({ shopId, invitedBy, email, role, tokenHash: hash, expiresAt })
    .returning({ id: invitations.id });
  return { id: row.id, token, expiresAt };
}

/** Revokes an open invitation of this shop; false when there is none with that id here. */
export async function revokeInvitation(shopId: string, invitationId: string): Promise<boolean> {
  const rows = await getDb()
    .delete(invitations)
    .where(and(eq(invitations.id, invitationId), eq(invitations.shopId, shopId), isNull(invitations.acceptedAt)))
    .returning({ id: invitations.id });
  return rows.length > 0;
}

/**
 * Changes a member's role (or removes them with `role: null`) for `actorId`, unless the member is the
 * actor or it leaves the shop without an owner. The owners are locked first, so two owners demoting
 * each other at once cannot both succeed. Returns false when no member with that id is in this shop.
 */
export async function changeMember(shopId: string, actorId: string, memberId: string, role: Role | null): Promise<boolean> {
  if (memberId === actorId) throw new OwnMembershipError();
  return getDb().transaction(async (tx) => {
    const owners = await tx
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.shopId, shopId), eq(users.role, "owner")))
      .for("update");
    const [member] = await tx.select({ role: users.role }).from(users).where(and(eq(users.id, memberId), eq(users.shopId, shopId)));
    if (!member) return false;
    if (member.role === "owner" && role !== "owner" && owners.length <= 1) throw new LastOwnerError();
    if (role === null) await tx.delete(users).where(and(eq(users.id, memberId), eq(users.shopId, shopId)));
    else await tx.update(users).set({ role }).where(and(eq(users.id, memberId), eq(users.shopId, shopId)));
    return true;
  });
}
