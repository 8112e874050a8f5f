import { defineConfig } from "vitest/config";

const pkgs = ["core", "maps", "spectra", "clusters", "estimators", "simulate", "plot", "cli"];

export default defineConfig({
  test: {
    projects: [
      ...pkgs.map((name) => ({
        test: {
          name,
          root: `./packages/${name}`,
          include: ["test/**/*.test.ts"],
          setupFiles: ["../../tests/support/allclose.ts"],
          testTimeout: 60_000,
        },
      })),
      {
        test: {
          name: "repo",
          root: ".",
          include: ["tests/**/*.test.ts"],
          exclude: ["tests/bench/**", "node_modules/**"],
          setupFiles: ["./tests/support/allclose.ts"],
          testTimeout: 300_000,
          hookTimeout: 300_000,
        },
      },
    ],
  },
});
