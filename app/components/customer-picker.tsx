// The order form's customer field: a text field with suggestions instead of a <select> of every
// customer (a shop with 800 would ship them all on every form). Typing asks /api/customers (swr) for
// up to 20 matches; picking one sets the hidden id beside the text. Without JavaScript the text alone
// is posted and the server finds the customer by it (models/customers.server.ts, chooseCustomer); the
// suggestions it was rendered with still show in the browser's own list.
import { useId, useState } from "react";
import useSWR from "swr";
import { customerLabel } from "~/lib/customer-schema";
import { Field } from "./forms";

type Customer = { id: string; name: string; email: string };

const fetchCustomers = async (url: string): Promise<Customer[]> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`Customers could not be searched (${res.status}).`);
  return ((await res.json()) as { customers: Customer[] }).customers;
};

type CustomerPickerProps = {
  /** the customer already chosen (the order's, or the one a link named), if any */
  chosen: Customer | null;
  /** suggestions rendered with the page: the first customers, or those a refused form matched */
  suggestions: Customer[];
  /** the text a refused form posted, shown again */
  text?: string;
  error?: string;
  className?: string;
};

export function CustomerPicker({ chosen, suggestions, text: postedText, error, className = "" }: CustomerPickerProps) {
  const listId = `customer-suggestions-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const [text, setText] = useState(postedText ?? (chosen ? customerLabel(chosen) : ""));
  const [picked, setPicked] = useState<Customer | null>(chosen && (postedText === undefined || postedText === customerLabel(chosen)) ? chosen : null);
  const query = text.trim();
  const { data } = useSWR(query && query !== (picked && customerLabel(picked)) ? `/api/customers?q=${encodeURIComponent(query.slice(0, 160))}` : null, fetchCustomers, {
    keepPreviousData: true,
    dedupingInterval: 1000,
  });
  const options = data ?? suggestions;
  const fieldId = "field-customerId"; // the field the server's message names

  const onChange = (value: string) => {
    setText(value);
    setPicked([...options, ...(picked ? [picked] : [])].find((c) => customerLabel(c) === value) ?? null);
  };

  return (
    <>
      <Field
        label="Customer"
        name="customer"
        id={fieldId}
        type="text"
        list={listId}
        value={text}
        onChange={(e) => onChange(e.target.value)}
        autoComplete="off"
        spellCheck={false}
        placeholder="Type part of a name or e-mail"
        error={error}
        hint={picked ? `Chosen: ${customerLabel(picked)}.` : "Pick a suggestion, or type a customer's name as it is saved."}
        className={className}
      />
      <input type="hidden" name="customerId" value={picked?.id ?? ""} />
      <datalist id={listId}>
        {options.map((c) => (
          <option key={c.id} value={customerLabel(c)} />
        ))}
      </datalist>
    </>
  );
}
