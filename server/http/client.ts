import path from "node:path";
import fs from "node:fs";
import type { Server } from "node:http";
import express, { type Express } from "express";

/** In index.html's <meta name="csp-nonce">; replaced per response in production. */
export const CSP_NONCE_PLACEHOLDER = "__SITECUE_CSP_NONCE__";

const root = path.resolve(import.meta.dirname, "../..");

/** Serves the React client: Vite middleware in development, the built files in production. */
export async function mountClient(
  app: Express,
  mode: "vite" | "static",
  httpServer?: Server,
): Promise<() => Promise<void>> {
  if (mode === "vite") {
    const { createServer } = await import("vite");
    const vite = await createServer({
      root,
      configFile: path.join(root, "vite.config.ts"),
      server: {
        middlewareMode: true,
        hmr: httpServer ? { server: httpServer } : false,
      },
      appType: "spa",
    });
    app.use(vite.middlewares);
    return () => vite.close();
  }
  // `npm test` builds each run's client into its own folder and says where.
  const dist =
    process.env.SITECUE_CLIENT_DIR ?? path.join(root, "dist", "client");
  const index = path.join(dist, "index.html");
  if (!fs.existsSync(index))
    throw new Error(
      `The built client is missing (${index}); run "npx vite build" first.`,
    );
  // A folder built before source maps were switched off may still hold them: never serve one.
  app.use((req, res, next) => {
    if (req.path.endsWith(".map")) res.status(404).end();
    else next();
  });
  app.use(
    "/assets",
    express.static(path.join(dist, "assets"), {
      immutable: true,
      maxAge: "1y",
      index: false,
    }),
  );
  app.use(express.static(dist, { index: false }));
  // Read once; each response gets its own CSP nonce in place of the placeholder (index.html).
  const html = fs.readFileSync(index, "utf8");
  app.get("/{*splat}", (_req, res) => {
    const nonce = String(res.locals.cspNonce ?? "");
    res.setHeader("Cache-Control", "no-cache");
    res.type("html").send(html.replaceAll(CSP_NONCE_PLACEHOLDER, nonce));
  });
  return async () => {};
}
