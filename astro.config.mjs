// @ts-check
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwind from "@astrojs/tailwind";

const extraHost = process.env.PUBLIC_HOSTNAME;
// Several checkouts or test runs can build side by side into folders of their own.
const buildDir = process.env.RINGLAND_BUILD_DIR;

export default defineConfig({
  output: "server",
  ...(buildDir ? { outDir: `${buildDir}/dist`, cacheDir: `${buildDir}/cache` } : {}),
  adapter: node({ mode: "standalone" }),
  integrations: [react(), tailwind({ applyBaseStyles: false })],
  server: { host: "127.0.0.1", port: 4321 },
  security: {
    checkOrigin: true,
    allowedDomains: [
      { hostname: "localhost" },
      { hostname: "127.0.0.1" },
      ...(extraHost ? [{ hostname: extraHost }] : []),
    ],
  },
  devToolbar: { enabled: false },
  vite: {
    ssr: { external: ["@node-rs/argon2", "sharp", "mysql2", "knex", "pdfkit"] },
  },
});
