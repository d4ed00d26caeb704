// Issue 13: production served source maps (the whole client source, comments included).
// OWASP WSTG-INFO-05 (Review Webpage Content for Information Leakage) lists them.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import express from "express";
import request from "supertest";
import { afterEach, expect, it } from "vitest";
import { mountClient } from "./client";

const root = path.resolve(import.meta.dirname, "../..");
const builtDir = () =>
  process.env.SITECUE_CLIENT_DIR ?? path.join(root, "dist", "client");
const savedDir = process.env.SITECUE_CLIENT_DIR;
afterEach(() => {
  if (savedDir === undefined) delete process.env.SITECUE_CLIENT_DIR;
  else process.env.SITECUE_CLIENT_DIR = savedDir;
});

it("builds the client without source maps, and its scripts point to none", async () => {
  const files = fs.readdirSync(builtDir(), { recursive: true }).map(String);
  expect(files.filter((f) => f.endsWith(".map"))).toEqual([]);
  const app = express();
  await mountClient(app, "static");
  const html = (await request(app).get("/").expect(200)).text;
  const script = /<script[^>]+src="([^"]+\.js)"/.exec(html)?.[1];
  expect(script).toMatch(/^\/assets\//);
  const js = await request(app).get(script!).expect(200);
  expect(js.text).not.toMatch(/sourceMappingURL/);
  await request(app).get(`${script}.map`).expect(404);
});

it("never serves a .map file left in the client folder by an older build", async () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "sitecue-client-"));
  try {
    fs.mkdirSync(path.join(dir, "assets"));
    fs.copyFileSync(
      path.join(builtDir(), "index.html"),
      path.join(dir, "index.html"),
    );
    fs.writeFileSync(path.join(dir, "assets", "old.js"), "console.log(1);\n");
    fs.writeFileSync(
      path.join(dir, "assets", "old.js.map"),
      '{"version":3,"sources":["src/secret.ts"]}',
    );
    process.env.SITECUE_CLIENT_DIR = dir;
    const app = express();
    await mountClient(app, "static");
    await request(app).get("/assets/old.js").expect(200);
    const map = await request(app).get("/assets/old.js.map");
    expect(map.status).toBe(404);
    expect(map.text).not.toContain("secret");
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
});
