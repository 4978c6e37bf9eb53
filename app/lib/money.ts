// Money is integer minor units (pence, cents) end to end; only these functions turn it into text.

/** Minor units per major unit for the currencies a shop may pick (ISO 4217 exponents). */
export const CURRENCIES = { GBP: 2, EUR: 2, USD: 2, CAD: 2, AUD: 2, NZD: 2, CHF: 2, SEK: 2, NOK: 2, DKK: 2, PLN: 2, JPY: 0 } as const;
export type Currency = keyof typeof CURRENCIES;

export function isCurrency(value: string): value is Currency {
  return value in CURRENCIES;
}

// Building an Intl.NumberFormat costs far more than formatting with one (a list of 25 orders spent
// most of its render making them), so each currency's formatter is made once.
const formatters = new Map<string, { format: Intl.NumberFormat["format"]; digits: number }>();

export function formatMoney(minor: number, currency: string): string {
  let formatter = formatters.get(currency);
  if (!formatter) {
    const digits = isCurrency(currency) ? CURRENCIES[currency] : 2;
    const format = new Intl.NumberFormat("en-GB", { style: "currency", currency, minimumFractionDigits: digits, maximumFractionDigits: digits }).format;
    formatters.set(currency, (formatter = { format, digits }));
  }
  return formatter.format(minor / 10 ** formatter.digits);
}

/** "12.50", "12,50", "£1,234.5" → minor units; null when it is not an amount. Never via floating-point sums. */
export function parseMoney(input: string, currency: string): number | null {
  const digits = isCurrency(currency) ? CURRENCIES[currency] : 2;
  const text = input.trim().replace(/^[^\d-]+/, "").replace(/\s/g, "");
  const match = /^(\d{1,3}(?:,\d{3})+|\d+)(?:[.,](\d+))?$/.exec(text);
  if (!match) return null;
  const whole = match[1].replace(/,/g, "");
  const fraction = match[2] ?? "";
  if (fraction.length > digits) return null;
  const minor = BigInt(whole) * 10n ** BigInt(digits) + BigInt(fraction.padEnd(digits, "0") || "0");
  return minor > BigInt(Number.MAX_SAFE_INTEGER) ? null : Number(minor);
}

/** The major-unit text a form shows for an amount ("85.00"). */
export function moneyInputValue(minor: number, currency: string): string {
  const digits = isCurrency(currency) ? CURRENCIES[currency] : 2;
  if (digits === 0) return String(minor);
  const sign = minor < 0 ? "-" : "";
  const abs = Math.abs(minor);
  return `${sign}${Math.floor(abs / 10 ** digits)}.${String(abs % 10 ** digits).padStart(digits, "0")}`;
}
