import { data, redirect } from "react-router";
import type { Route } from "./+types/pay.$token.checkout";
import { publicOrigin } from "~/mail.server";
import { checkoutUrl, depositByToken, DepositError } from "~/models/deposits.server";
import { paymentErrorMessage } from "~/payments.server";

// Following the "Pay" link opens the payment service's checkout page. It is a link (GET), like the
// service's own payment links, so the page's form-action policy never blocks the hop to another
// origin; all it stores is which Checkout Session is open, and it reuses that one while it lasts.
export async function loader({ params, request }: Route.LoaderArgs) {
  const deposit = await depositByToken(params.token);
  if (!deposit) throw data("This payment link is not known. Check the link in your e-mail, or ask the shop.", { status: 404 });
  if (deposit.status !== "requested" || deposit.orderStatus === "cancelled") return redirect(`/pay/${deposit.linkToken}`);
  try {
    return redirect(await checkoutUrl(deposit, publicOrigin(request)), { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DepositError) throw data(error.message, { status: 409 });
    console.error("checkout session:", error);
    throw data(`The payment service could not be reached (${paymentErrorMessage(error)}). Nothing was charged; try again in a moment.`, { status: 502 });
  }
}
