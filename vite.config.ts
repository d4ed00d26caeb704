import { defineConfig } from "vite";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";

// The server mounts this config in middleware mode during development and serves
// dist/client in production, so no dev-server port or proxy is configured here.
export default defineConfig({
  plugins: [react(), tailwindcss()],
  // Only src, server, shared and tests are allowed at the top level: static assets
  // live in src/assets and are imported, so there is no public folder.
  publicDir: false,
  // Test runs build clients into .data/test/…; the dev server must not reload on those.
  server: { watch: { ignored: ["**/.data/**", "**/tests/output/**"] } },
  build: {
    outDir: "dist/client",
    emptyOutDir: true,
    // No source maps in the build: production would serve the whole client source to anyone
    // (issue 13; OWASP WSTG-INFO-05, "Review Webpage Content for Information Leakage").
    sourcemap: false,
  },
});
