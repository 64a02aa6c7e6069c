// @ts-check
import { defineConfig } from "astro/config";
import node from "@astrojs/node";
import react from "@astrojs/react";
import tailwind from "@astrojs/tailwind";

const extraHost = process.env.PUBLIC_HOSTNAME;

export default defineConfig({
  output: "server",
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
