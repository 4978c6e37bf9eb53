import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  future: { v8_middleware: true },
  // bin/test builds into a folder of its own, so a run never swaps the assets under a running bin/start.
  buildDirectory: process.env.STOPWISE_BUILD_DIR || "build",
} satisfies Config;
