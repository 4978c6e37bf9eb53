/** The ledger pages' month picker: a month input and its Show button, inside the page's GET form. */
export function MonthChoice({ month }: { month: string }) {
  return (
    <>
      <label className="space-y-1 text-sm font-medium">
        <span className="block">Month</span>
        <input type="month" name="month" defaultValue={month} className="block min-h-11 rounded-md border border-line bg-white px-3" />
      </label>
      <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
        Show
      </button>
    </>
  );
}
