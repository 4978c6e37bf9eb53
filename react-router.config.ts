import type { Config } from "@react-router/dev/config";

// bin/test builds into a folder of its own, so a run never swaps the assets under a running bin/start;
// bin/serve.ts and test/support/app.ts read the build from the same place.
export const buildDirectory = process.env.STOPWISE_BUILD_DIR || "build";

export default {
  ssr: true,
  future: { v8_middleware: true },
  buildDirectory,
} satisfies Config;
