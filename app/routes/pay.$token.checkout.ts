import { redirect } from "react-router";
import type { Route } from "./+types/pay.$token.checkout";
import { publicOrigin } from "~/mail.server";
import { checkoutUrl, depositByToken, DepositError } from "~/models/deposits.server";
import { refusedByService } from "~/payments.server";

// Following the "Pay" link opens the payment service's checkout page. It is a link (GET), like the
// service's own payment links, so the page's form-action policy never blocks the hop to another
// origin; all it stores is which Checkout Session is open, and it reuses that one while it lasts.
// Whatever goes wrong sends the customer back to the deposit's page, which says what to do.
export async function loader({ params, request }: Route.LoaderArgs) {
  const deposit = await depositByToken(params.token);
  if (!deposit) return new Response("This payment link is not known. Check the link in your e-mail, or ask the shop.", { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  const back = `/pay/${deposit.linkToken}`;
  if (deposit.status !== "requested" || deposit.orderStatus === "cancelled") return redirect(back);
  try {
    return redirect(await checkoutUrl(deposit, publicOrigin(request)), { headers: { "Cache-Control": "no-store" } });
  } catch (error) {
    if (error instanceof DepositError) return redirect(back);
    console.error("checkout session:", error);
    // Refused (a bad amount, a wrong key) is the shop's to fix; unreachable is worth a retry.
    return redirect(`${back}?${refusedByService(error) ? "refused" : "unavailable"}=1`);
  }
}
