import { checkDatabase } from "~/db.server";

// Readiness: 200 when the database answers, 503 with the reason when it does not.
export async function loader() {
  const database = await checkDatabase();
  const headers = { "Cache-Control": "no-store" };
  if (database.ok) return Response.json({ status: "ok", database: "reachable" }, { headers });
  return Response.json(
    { status: "unavailable", database: "unreachable", reason: database.reason },
    { status: 503, headers },
  );
}
