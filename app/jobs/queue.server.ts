import PgBoss from "pg-boss";

// The job queue lives in PostgreSQL (pg-boss), so more app servers and plan runners can join
// without new infrastructure.
export const PLAN_QUEUE = "plan-batch";
export type PlanJobData = { planId: string };

let started: Promise<PgBoss> | undefined;

export function queue(): Promise<PgBoss> {
  started ??= (async () => {
    const url = process.env.DATABASE_URL;
    if (!url) throw new Error("DATABASE_URL is not set");
    const boss = new PgBoss({ connectionString: url, max: 4 });
    boss.on("error", (error) => console.error("job queue:", error.message));
    // Several processes may start at once on a fresh database (server, runner, tests): whoever
    // loses the race to create pg-boss's tables or the queue tries again.
    for (let attempt = 1; ; attempt++) {
      try {
        await boss.start();
        // A plan that fails is shown to the planner with its reason; running it again is their call.
        if (!(await boss.getQueue(PLAN_QUEUE))) await boss.createQueue(PLAN_QUEUE, { name: PLAN_QUEUE, retryLimit: 0, expireInSeconds: 15 * 60 });
        return boss;
      } catch (error) {
        if (attempt >= 5) throw error;
        await new Promise((r) => setTimeout(r, 200 * attempt));
      }
    }
  })().catch((error) => {
    started = undefined;
    throw error;
  });
  return started;
}

export async function stopQueue(): Promise<void> {
  if (!started) return;
  const boss = await started.catch(() => null);
  started = undefined;
  await boss?.stop({ graceful: true, wait: true, timeout: 5000 });
}
