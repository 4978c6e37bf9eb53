import * as v from "valibot";
import { data, Form, useActionData } from "react-router";
import type { Route } from "./+types/team";
import { requirePermission } from "~/auth.server";
import { Field, FormAlert, SelectField, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { invitationEmail } from "~/lib/emails";
import { parseForm } from "~/lib/forms";
import { EmailSchema } from "~/lib/password-policy";
import { ROLES } from "~/lib/permissions";
import { publicOrigin, sendMail } from "~/mail.server";
import { getShop } from "~/models/shops.server";
import { changeMember, createInvitation, emailInUse, LastOwnerError, listMembers, listOpenInvitations, OwnMembershipError, revokeInvitation } from "~/models/team.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "team:manage");
  const [members, invitations] = await Promise.all([listMembers(user.shopId), listOpenInvitations(user.shopId)]);
  return { me: user.id, members, invitations };
}

const RoleSchema = v.picklist(ROLES, "Choose one of the roles.");
const IdSchema = v.pipe(v.string("Missing id."), v.nonEmpty("Missing id."), v.maxLength(64, "Not a valid id."));
const Uuid = v.pipe(v.string("Missing id."), v.uuid("Not a valid id."));

const TeamActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("invite"), email: EmailSchema, role: RoleSchema }),
  v.object({ intent: v.literal("role"), memberId: IdSchema, role: RoleSchema }),
  v.object({ intent: v.literal("remove"), memberId: IdSchema }),
  v.object({ intent: v.literal("revoke"), invitationId: Uuid }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "team:manage");
  const form = await args.request.formData();
  // Only the invitation shows its role next to a field; a member row's role comes from a fixed list.
  const hidden = form.get("intent") === "invite" ? ["memberId", "invitationId"] : ["memberId", "invitationId", "role"];
  const parsed = parseForm(TeamActionSchema, form, hidden);
  if (!parsed.ok) return data({ intent: String(form.get("intent")), errors: parsed.errors, notice: null }, { status: 400 });
  const input = parsed.data;

  switch (input.intent) {
    case "invite": {
      if (await emailInUse(input.email)) {
        return data({ intent: input.intent, errors: { email: "This address already has a Stopwise account." }, notice: null }, { status: 400 });
      }
      const [{ id, token, expiresAt }, { timeZone }] = await Promise.all([createInvitation(user.shopId, user.id, input.email, input.role), getShop(user.shopId)]);
      const link = `${publicOrigin(args.request)}/invitation/${token}`;
      try {
        await sendMail({ to: input.email, ...invitationEmail({ shopName: user.shopName, inviterName: user.name, role: input.role, link, expiresAt, timeZone }) });
      } catch (error) {
        // No invitation without its e-mail: take it back so a retry starts clean.
        await revokeInvitation(user.shopId, id);
        const reason = error instanceof Error ? error.message : String(error);
        return data({ intent: input.intent, errors: { form: `The invitation could not be e-mailed (${reason}). Nothing was saved; try again.` }, notice: null }, { status: 502 });
      }
      return { intent: input.intent, errors: {}, notice: `Invitation sent to ${input.email}.` };
    }
    case "role":
    case "remove": {
      try {
        const found = await changeMember(user.shopId, user.id, input.memberId, input.intent === "role" ? input.role : null);
        if (!found) throw data("No such member in this shop.", { status: 404 });
      } catch (error) {
        if (error instanceof LastOwnerError || error instanceof OwnMembershipError) return data({ intent: input.intent, errors: { form: error.message }, notice: null }, { status: 409 });
        throw error;
      }
      return { intent: input.intent, errors: {}, notice: input.intent === "role" ? "Role changed." : "Member removed; their sessions have ended." };
    }
    case "revoke": {
      if (!(await revokeInvitation(user.shopId, input.invitationId))) throw data("No such invitation in this shop.", { status: 404 });
      return { intent: input.intent, errors: {}, notice: "Invitation withdrawn." };
    }
  }
}

function RoleOptions() {
  return ROLES.map((r) => (
    <option key={r} value={r}>
      {r}
    </option>
  ));
}

/** Role change and removal of another member (never one's own row: see OwnMembershipError). */
function MemberControls({ member }: { member: { id: string; name: string; role: string } }) {
  return (
    <div className="flex flex-wrap items-end gap-2">
      <Form method="post" className="flex items-end gap-2">
        <input type="hidden" name="intent" value="role" />
        <input type="hidden" name="memberId" value={member.id} />
        <SelectField label={`Role of ${member.name}`} name="role" id={`role-${member.id}`} defaultValue={member.role} className="[&>label]:sr-only">
          <RoleOptions />
        </SelectField>
        <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
          Change role
        </button>
      </Form>
      <Form method="post" onSubmit={(e) => !confirm(`Remove ${member.name} from the shop?`) && e.preventDefault()}>
        <input type="hidden" name="intent" value="remove" />
        <input type="hidden" name="memberId" value={member.id} />
        <button type="submit" className="min-h-11 rounded-md border border-bad/40 px-4 font-medium text-bad hover:bg-bad-soft">
          Remove
        </button>
      </Form>
    </div>
  );
}

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric" });

export default function Team({ loaderData }: Route.ComponentProps) {
  const actionData = useActionData<typeof action>();
  const errors: Record<string, string> = actionData?.errors ?? {};
  const { members, invitations, me } = loaderData;
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Owner" title="Team">
        Everyone who works in this shop, and what their role lets them do.
      </PageHeader>

      {actionData?.notice && <FormAlert tone="ok">{actionData.notice}</FormAlert>}
      {errors.form && <FormAlert>{errors.form}</FormAlert>}

      <section className="space-y-3" aria-labelledby="members-heading">
        <h2 id="members-heading" className="text-xl font-semibold">Members</h2>
        <ul className="divide-y divide-line rounded-lg border border-line bg-card">
          {members.map((m) => (
            <li key={m.id} className="flex flex-col gap-3 p-4 md:flex-row md:items-center md:justify-between" data-member={m.email}>
              <div>
                <p className="font-semibold">
                  {m.name} {m.id === me && <span className="text-sm font-normal text-muted">(you)</span>}
                </p>
                <p className="text-sm text-muted">{m.email}</p>
              </div>
              {m.id === me ? (
                <p className="text-sm text-muted">{m.role} · another owner can change your role or remove you</p>
              ) : (
                <MemberControls member={m} />
              )}
            </li>
          ))}
        </ul>
      </section>

      <section className="grid gap-6 lg:grid-cols-2">
        <div className="space-y-3 rounded-lg border border-line bg-card p-5">
          <h2 className="text-xl font-semibold">Invite someone</h2>
          <p className="text-sm text-muted">They get an e-mail with a link that works once, for seven days.</p>
          <Form method="post" className="space-y-4" noValidate>
            <input type="hidden" name="intent" value="invite" />
            <Field label="E-mail" name="email" type="email" required error={actionData?.intent === "invite" ? errors.email : undefined} />
            <SelectField label="Role" name="role" defaultValue="sawyer" error={actionData?.intent === "invite" ? errors.role : undefined}>
              <RoleOptions />
            </SelectField>
            <SubmitButton pendingText="Sending…">Send invitation</SubmitButton>
          </Form>
        </div>
        <div className="space-y-3">
          <h2 className="text-xl font-semibold">Open invitations</h2>
          {invitations.length === 0 ? (
            <p className="text-muted">None waiting.</p>
          ) : (
            <ul className="divide-y divide-line rounded-lg border border-line bg-card">
              {invitations.map((i) => (
                <li key={i.id} className="flex items-center justify-between gap-3 p-4">
                  <div>
                    <p className="font-medium">{i.email}</p>
                    <p className="text-sm text-muted">
                      {i.role} · until {dateFormat.format(new Date(i.expiresAt))}
                    </p>
                  </div>
                  <Form method="post">
                    <input type="hidden" name="intent" value="revoke" />
                    <input type="hidden" name="invitationId" value={i.id} />
                    <button type="submit" className="min-h-11 rounded-md border border-line px-4 text-sm font-medium hover:border-edge">
                      Withdraw
                    </button>
                  </Form>
                </li>
              ))}
            </ul>
          )}
        </div>
      </section>
    </div>
  );
}
