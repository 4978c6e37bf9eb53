import { data, isRouteErrorResponse, Link } from "react-router";
import type { Route } from "./+types/pay.$token";
import { AuthCard, FormAlert } from "~/components/forms";
import { formatMoney } from "~/lib/money";
import { depositByToken, sessionPaid } from "~/models/deposits.server";

// The customer's page of a deposit's payment link: no sign-in, the token in the address is the key.
export async function loader({ params, request }: Route.LoaderArgs) {
  const deposit = await depositByToken(params.token);
  if (!deposit) throw data("This payment link is not known. Check the link in your e-mail, or ask the shop.", { status: 404 });
  const url = new URL(request.url);
  const sessionId = url.searchParams.get("session");
  // Coming back from the checkout page: the webhook may land a moment later than the customer.
  const justPaid = deposit.status === "requested" && sessionId ? await sessionPaid(deposit, sessionId) : false;
  return {
    shopName: deposit.shopName,
    orderNumber: deposit.orderNumber,
    amount: formatMoney(deposit.amountMinor, deposit.currency),
    state: deposit.status !== "requested" || justPaid ? ("paid" as const) : deposit.orderStatus === "cancelled" ? ("cancelled-order" as const) : ("due" as const),
    refunded: deposit.status === "refunded",
    cameBackCancelled: url.searchParams.get("cancelled") === "1",
    serviceDown: url.searchParams.get("unavailable") === "1",
    serviceRefused: url.searchParams.get("refused") === "1",
    token: deposit.linkToken,
  };
}

export default function PayDeposit({ loaderData }: Route.ComponentProps) {
  const { shopName, orderNumber, amount, state, refunded, cameBackCancelled, serviceDown, serviceRefused, token } = loaderData;
  return (
    <AuthCard title={`Deposit for order #${orderNumber}`} footer={<>Payments are taken by the shop's payment service; Stopwise never sees card details.</>}>
      <p>
        <span className="font-medium">{shopName}</span> asks a deposit of <strong className="tabular-nums">{amount}</strong> towards your order #{orderNumber}.
      </p>
      {state === "paid" && !refunded && (
        <FormAlert tone="ok">
          Thank you: your deposit of {amount} is paid. {shopName} will be in touch about the balance before delivery.
        </FormAlert>
      )}
      {refunded && <FormAlert tone="warn">This deposit was refunded to you. Nothing is due on this link.</FormAlert>}
      {state === "cancelled-order" && <FormAlert tone="warn">This order was cancelled; no deposit is due.</FormAlert>}
      {state === "due" && (
        <>
          {cameBackCancelled && <FormAlert tone="warn">No payment was taken. You can pay whenever you are ready with the same link.</FormAlert>}
          {serviceDown && <FormAlert>The payment service could not be reached. Nothing was charged; try again in a moment.</FormAlert>}
          {serviceRefused && <FormAlert>The payment service would not open a checkout for this deposit. Nothing was charged; please reply to the shop's e-mail so they can sort it out.</FormAlert>}
          <Link
            to={`/pay/${token}/checkout`}
            reloadDocument
            className="inline-flex min-h-11 w-full items-center justify-center rounded-md bg-edge px-5 py-2.5 font-semibold text-white hover:bg-edge-dark"
          >
            Pay {amount} now
          </Link>
        </>
      )}
    </AuthCard>
  );
}

// A customer is not signed in: the shell's error page (with its way home) would lead them to sign-in.
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const known = isRouteErrorResponse(error) && error.status < 500;
  return (
    <AuthCard title={known && error.status === 404 ? "This payment link is not known" : "The payment page could not be shown"}>
      <FormAlert tone="warn">
        {known && typeof error.data === "string" ? error.data : "Nothing was charged. Try the link again in a moment; if it keeps failing, reply to the shop's e-mail."}
      </FormAlert>
    </AuthCard>
  );
}
