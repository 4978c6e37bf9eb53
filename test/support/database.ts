// The throw-away cluster that bin/test starts, and ways to stop and restart it for fault tests.
import { execFileSync } from "node:child_process";
import { fileURLToPath } from "node:url";

const pgScript = fileURLToPath(new URL("../../bin/pg", import.meta.url));

export function testCluster() {
  const dir = process.env.STOPWISE_TEST_PG_DIR;
  const port = process.env.STOPWISE_TEST_DB_PORT;
  if (!dir || !port) throw new Error("STOPWISE_TEST_PG_DIR / STOPWISE_TEST_DB_PORT are not set: run the tests through bin/test");
  return {
    stop: () => execFileSync(pgScript, ["stop", dir], { stdio: "inherit" }),
    start: () => execFileSync(pgScript, ["start", dir, port], { stdio: "inherit" }),
  };
}
