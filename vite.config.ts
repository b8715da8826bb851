import { fileURLToPath } from "node:url";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vitest/config";

const here = (path: string) => fileURLToPath(new URL(path, import.meta.url));
const apiTarget = `http://127.0.0.1:${process.env.LOTWISE_PORT ?? "5180"}`;

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      "@/": here("./src/"),
      "@shared/": here("./shared/"),
      "@server/": here("./server/"),
    },
  },
  build: {
    outDir: "dist/client",
    emptyOutDir: true,
    chunkSizeWarningLimit: 700,
  },
  server: {
    host: "127.0.0.1",
    port: Number(process.env.LOTWISE_DEV_PORT ?? 5173),
    proxy: { "/api": { target: apiTarget, changeOrigin: false } },
  },
  test: {
    include: ["tests/**/*.test.ts"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
    maxWorkers: 2,
    fileParallelism: true,
  },
});
