import { useState } from "react";
import { decodeUtf8, parsePersonalisationCsv } from "~/lib/personalisation-csv";
import { formatMoney } from "~/lib/money";

export type ProductChoice = { id: string; name: string; priceMinor: number };

const inputClass = (error?: string) => `block w-full rounded-md border bg-white px-3 py-2.5 text-base ${error ? "border-bad" : "border-line"}`;

function Error({ id, message }: { id: string; message?: string }) {
  return message ? (
    <p id={id} className="text-sm font-medium text-bad">
      {message}
    </p>
  ) : null;
}

/** One line of an order form (fields line-N-…); the CSV is previewed in the browser when scripts run. */
export function OrderLineFields({ index, products, currency, errors, values, onRemove }: {
  index: number;
  products: ProductChoice[];
  currency: string;
  errors: Record<string, string>;
  values?: Record<string, string>;
  onRemove?: () => void;
}) {
  const name = (f: string) => `line-${index}-${f}`;
  const err = (f: string) => errors[name(f)];
  const [headers, setHeaders] = useState<string[]>([]);
  const [preview, setPreview] = useState<string | null>(null);
  const [csvText, setCsvText] = useState<string | null>(null);
  const [header, setHeader] = useState(values?.[name("csvHeader")] ?? "");

  function describe(text: string | null, chosen: string) {
    if (text === null) return setPreview(null);
    const parsed = parsePersonalisationCsv(text, chosen);
    setHeaders(parsed.headers ?? []);
    setPreview(parsed.ok ? `${parsed.texts.length} texts under "${parsed.column}", from "${parsed.texts[0]}" to "${parsed.texts.at(-1)}".` : parsed.error);
  }

  async function onCsv(event: React.ChangeEvent<HTMLInputElement>) {
    const file = event.target.files?.[0];
    if (!file) return describe(null, header);
    const text = decodeUtf8(new Uint8Array(await file.arrayBuffer()));
    setCsvText(text);
    if (text === null) return setPreview(`"${file.name}" is not a text CSV file in UTF-8.`);
    describe(text, header);
  }

  return (
    <fieldset className="space-y-4 rounded-lg border border-line bg-card p-4" data-line={index}>
      <legend className="px-1 text-sm font-semibold">Line {index + 1}</legend>
      <div className="grid gap-4 sm:grid-cols-[1fr_9rem]">
        <div className="space-y-1">
          <label htmlFor={name("product")} className="block text-sm font-medium">
            Product
          </label>
          <select id={name("product")} name={name("product")} defaultValue={values?.[name("product")] ?? ""} className={inputClass(err("product"))} aria-invalid={err("product") ? true : undefined} aria-describedby={`${name("product")}-error`}>
            <option value="">Choose…</option>
            {products.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name} · {formatMoney(p.priceMinor, currency)}
              </option>
            ))}
          </select>
          <Error id={`${name("product")}-error`} message={err("product")} />
        </div>
        <div className="space-y-1">
          <label htmlFor={name("quantity")} className="block text-sm font-medium">
            Quantity
          </label>
          <input id={name("quantity")} name={name("quantity")} inputMode="numeric" defaultValue={values?.[name("quantity")] ?? "1"} className={inputClass(err("quantity"))} aria-invalid={err("quantity") ? true : undefined} aria-describedby={`${name("quantity")}-error`} />
          <Error id={`${name("quantity")}-error`} message={err("quantity")} />
        </div>
      </div>

      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name={name("followRows")} defaultChecked={values?.[name("followRows")] === "on"} className="h-5 w-5 accent-edge" />
        The quantity follows the number of personalisation texts
      </label>

      <div className="grid gap-4 lg:grid-cols-2">
        <div className="space-y-1">
          <label htmlFor={name("texts")} className="block text-sm font-medium">
            Personalisation, one text per line
          </label>
          <textarea id={name("texts")} name={name("texts")} rows={4} defaultValue={values?.[name("texts")]} placeholder={"Table 1\nTable 2"} className={inputClass(err("texts"))} />
          <Error id={`${name("texts")}-error`} message={err("texts")} />
        </div>
        <div className="space-y-3">
          <div className="space-y-1">
            <label htmlFor={name("csv")} className="block text-sm font-medium">
              …or upload them as CSV (UTF-8, up to 2,000 rows)
            </label>
            <input id={name("csv")} name={name("csv")} type="file" accept=".csv,text/csv,text/plain" onChange={onCsv} className="block w-full text-sm file:mr-3 file:min-h-11 file:rounded-md file:border file:border-line file:bg-white file:px-3" />
            <Error id={`${name("csv")}-error`} message={err("csv")} />
          </div>
          <div className="space-y-1">
            <label htmlFor={name("csvHeader")} className="block text-sm font-medium">
              Column to use (its header; empty: the first)
            </label>
            <input
              id={name("csvHeader")}
              name={name("csvHeader")}
              list={`${name("csvHeader")}-list`}
              value={header}
              onChange={(e) => {
                setHeader(e.target.value);
                describe(csvText, e.target.value);
              }}
              className={inputClass(err("csvHeader"))}
            />
            <datalist id={`${name("csvHeader")}-list`}>
              {headers.map((h) => (
                <option key={h} value={h} />
              ))}
            </datalist>
            <Error id={`${name("csvHeader")}-error`} message={err("csvHeader")} />
            {/* The server's message for the same column is already shown just above. */}
            {preview && preview !== err("csvHeader") && (
              <p className="text-sm text-muted" role="status">
                {preview}
              </p>
            )}
          </div>
        </div>
      </div>

      <div className="grid gap-4 lg:grid-cols-2">
        <div className="space-y-1">
          <label htmlFor={name("files")} className="block text-sm font-medium">
            Artwork (SVG, PNG or PDF, up to 10 MB each)
          </label>
          <input id={name("files")} name={name("files")} type="file" multiple accept=".svg,.png,.pdf,image/svg+xml,image/png,application/pdf" className="block w-full text-sm file:mr-3 file:min-h-11 file:rounded-md file:border file:border-line file:bg-white file:px-3" />
          <Error id={`${name("files")}-error`} message={err("files")} />
        </div>
        <div className="space-y-1">
          <label htmlFor={name("notes")} className="block text-sm font-medium">
            Notes for this line
          </label>
          <input id={name("notes")} name={name("notes")} defaultValue={values?.[name("notes")]} className={inputClass(err("notes"))} />
          <Error id={`${name("notes")}-error`} message={err("notes")} />
        </div>
      </div>
      {onRemove && (
        <button type="button" onClick={onRemove} className="text-sm font-medium text-bad underline">
          Remove this line
        </button>
      )}
    </fieldset>
  );
}
