import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vitest/config";

// Vitest sets VITEST; the React Router plugin stays out of tests, which import modules directly.
const underTest = Boolean(process.env.VITEST);

export default defineConfig({
  plugins: underTest ? [] : [tailwindcss(), reactRouter()],
  resolve: { tsconfigPaths: true },
  test: {
    include: ["test/**/*.test.ts"],
    environment: "node",
    setupFiles: ["test/support/fast-check-seed.ts"],
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
