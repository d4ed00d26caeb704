// Scenario 5 of the brief in the browser (issue 7): the owner uploads the elevation drawing (a
// 3.6 MB, two-page PDF) as Rev A for the coving tasks, shared with the plasterer and the
// electrician, watching a real upload progress bar reach 100 % (upload throttled through the
// DevTools protocol so progress is visible); a refused file shows the server's own words; the
// drawing page draws the PDF with pdf.js under the production CSP, pages on, then Rev B goes up
// and Rev A stays downloadable, byte for byte. The linked tasks' readiness reads as the
// programme says ("Clear to start from …" / "Waiting on …", computed here from the programme
// API); the height caution shows. The plasterer, on a 375 px phone, sees the drawing and adds a
// template photo to their own task from the camera input. axe-core on the drawing page.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import {
  cautionFor,
  type DrawingDetail,
  type JobSummary,
  type ProgrammeResponse,
} from "../../shared/schemas";
import { startTestApp, type TestApp } from "../setup/test-app";
import { sampleDxf } from "../setup/uploads";
import { demoAccounts, demoJobTitles } from "../factories/demo-scenario";
import {
  apiGet,
  axeSeriousOrWorse,
  dayText,
  desktop,
  launchBrowser,
  phone,
  shot,
  signInPage,
  visible,
} from "./browser";

let t: TestApp;
let browser: Browser;

beforeAll(async () => {
  t = await startTestApp({ demo: true, listen: true });
  browser = await launchBrowser();
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await t?.close();
});

const signInAs = (email: string, viewport = desktop) =>
  signInPage(browser, t.url!, email, { viewport, acceptDownloads: true });

const jobTitle = demoJobTitles.alcoves;
const plasterer = "Ashby Plaster & Coving";
const electrician = "Brightwire Electrical";
// Not the demo seed's "Elevation, alcoves" (seeded only where a bucket is given), so the two never meet.
const drawingTitle = "Elevation, both alcoves";
const covingTasks = ["Template coving", "Fit coving & make good"];

/**
 * A valid two-page PDF (ISO 32000-1 §7.5: header, indirect objects, a cross-reference table of
 * byte offsets, trailer): page 1 a labelled elevation in line work, page 2 an uncompressed RGB
 * image of `side`² pixels, which is what makes the file big enough to watch it upload.
 */
function elevationPdf(label: string, side: number): Buffer {
  const pixels = Buffer.alloc(side * side * 3);
  for (let y = 0; y < side; y++)
    for (let x = 0; x < side; x++) {
      const i = (y * side + x) * 3;
      // A plaster-coloured gradient with a grid every 50 px: not one flat colour.
      const grid = x % 50 === 0 || y % 50 === 0;
      pixels[i] = grid ? 60 : 200 + ((x * 37) % 40);
      pixels[i + 1] = grid ? 70 : 180 + ((y * 17) % 50);
      pixels[i + 2] = grid ? 90 : 150 + (((x + y) * 7) % 60);
    }
  const page1 = [
    "BT /F1 26 Tf 60 780 Td (" + label + ") Tj ET",
    "BT /F1 12 Tf 60 760 Td (Hollin & Vane Joinery - front room, both alcoves - all sizes in mm) Tj ET",
    "1.5 w 60 120 m 60 700 l 260 700 l 260 120 l h S",
    "335 120 m 335 700 l 535 700 l 535 120 l h S",
    "0.75 w 60 660 m 260 660 l S 335 660 m 535 660 l S",
    "60 400 m 260 400 l S 335 400 m 535 400 l S",
    "160 120 m 160 400 l S 435 120 m 435 400 l S",
    "BT /F1 10 Tf 120 672 Td (Coving line) Tj ET",
    "BT /F1 10 Tf 130 100 Td (1040) Tj ET BT /F1 10 Tf 405 100 Td (1052) Tj ET",
  ].join("\n");
  const page2 = `q 475 0 0 475 60 220 cm /Im1 Do Q\nBT /F1 16 Tf 60 720 Td (${label}: survey grid) Tj ET`;
  const objects: Buffer[] = [
    Buffer.from("<< /Type /Catalog /Pages 2 0 R >>"),
    Buffer.from("<< /Type /Pages /Kids [3 0 R 5 0 R] /Count 2 >>"),
    Buffer.from(
      "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 7 0 R >> >> /Contents 4 0 R >>",
    ),
    Buffer.from(
      `<< /Length ${Buffer.byteLength(page1)} >>\nstream\n${page1}\nendstream`,
    ),
    Buffer.from(
      "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 7 0 R >> /XObject << /Im1 8 0 R >> >> /Contents 6 0 R >>",
    ),
    Buffer.from(
      `<< /Length ${Buffer.byteLength(page2)} >>\nstream\n${page2}\nendstream`,
    ),
    Buffer.from(
      "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>",
    ),
    Buffer.concat([
      Buffer.from(
        `<< /Type /XObject /Subtype /Image /Width ${side} /Height ${side} /ColorSpace /DeviceRGB /BitsPerComponent 8 /Length ${pixels.length} >>\nstream\n`,
      ),
      pixels,
      Buffer.from("\nendstream"),
    ]),
  ];
  const chunks: Buffer[] = [
    Buffer.from("%PDF-1.7\n%\xE2\xE3\xCF\xD3\n", "latin1"),
  ];
  let offset = chunks[0].length;
  const offsets: number[] = [];
  objects.forEach((body, i) => {
    const chunk = Buffer.concat([
      Buffer.from(`${i + 1} 0 obj\n`),
      body,
      Buffer.from("\nendobj\n"),
    ]);
    offsets.push(offset);
    offset += chunk.length;
    chunks.push(chunk);
  });
  // Each xref entry is exactly 20 bytes: 10-digit offset, space, 5-digit generation, space, n, CRLF.
  const xref = [
    "xref",
    `0 ${objects.length + 1}`,
    "0000000000 65535 f\r",
    ...offsets.map((o) => `${String(o).padStart(10, "0")} 00000 n\r`),
    "trailer",
    `<< /Size ${objects.length + 1} /Root 1 0 R >>`,
    "startxref",
    String(offset),
    "%%EOF",
    "",
  ].join("\n");
  chunks.push(Buffer.from(xref, "latin1"));
  return Buffer.concat(chunks);
}

const revA = elevationPdf("Elevation, both alcoves - Rev A", 1100);
const revB = elevationPdf("Elevation, both alcoves - Rev B", 1000);

/** The readiness the programme gives a task, in the brief's words (Words table: clear to start / waiting on). */
function expectedReadiness(p: ProgrammeResponse, taskId: string): string {
  const result = (id: string) => p.result.tasks.find((r) => r.id === id)!;
  const name = (id: string) => p.tasks.find((x) => x.id === id)!.name;
  const r = result(taskId);
  switch (r.readiness.state) {
    case "done":
      return "Done";
    case "started":
      return "Started";
    case "clear":
      return `Clear to start from ${dayText(r.plannedStart)}`;
    case "waiting":
      return `Waiting on ${r.readiness.waitingOn
        .map(
          (w) =>
            `${name(w.task)} (planned ${dayText(result(w.task).plannedFinish)})`,
        )
        .join(", ")}`;
  }
}

/**
 * Slows the page's uploads (DevTools protocol, Network.emulateNetworkConditions) so the
 * progress bar has time to be seen between 0 and 100 %.
 */
async function throttleUploads(page: Page, bytesPerSecond: number) {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Network.enable");
  await cdp.send("Network.emulateNetworkConditions", {
    offline: false,
    latency: 0,
    downloadThroughput: -1,
    uploadThroughput: bytesPerSecond,
  });
  return async () => {
    await cdp.send("Network.emulateNetworkConditions", {
      offline: false,
      latency: 0,
      downloadThroughput: -1,
      uploadThroughput: -1,
    });
  };
}

/** Records every aria-valuenow any progress bar takes from now on (it may be gone by the time we look). */
async function recordProgress(page: Page): Promise<void> {
  await page.evaluate(() => {
    const w = window as unknown as { __progress: number[] };
    w.__progress = [];
    const read = () =>
      document.querySelectorAll('[role="progressbar"]').forEach((el) => {
        const v = Number(el.getAttribute("aria-valuenow"));
        if (w.__progress.at(-1) !== v) w.__progress.push(v);
      });
    new MutationObserver(read).observe(document.body, {
      subtree: true,
      childList: true,
      attributes: true,
      attributeFilter: ["aria-valuenow"],
    });
  });
}
const progressSeen = (page: Page) =>
  page.evaluate(
    () => (window as unknown as { __progress: number[] }).__progress,
  );

/** How many of the canvas's sampled pixels are not blank (pdf.js drew something). */
async function inkedPixels(canvas: Locator): Promise<number> {
  return canvas.evaluate((el) => {
    const c = el as HTMLCanvasElement;
    const data = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
    let inked = 0;
    for (let i = 0; i < data.length; i += 4 * 97)
      if (data[i + 3] > 0 && (data[i] < 235 || data[i + 1] < 235)) inked++;
    return inked;
  });
}

const drawingsRegion = (page: Page) =>
  page.getByRole("region", { name: "Drawings" });

describe("scenario 5: drawings and templates", () => {
  let jobId = "";
  let drawingId = "";
  let owner: { page: Page; problems: string[] };

  it("a file Sitecue does not take is refused in words: too large or SVG in the browser, a false PDF by the server", async () => {
    owner = await signInAs(demoAccounts.owner.email);
    const { page } = owner;
    const jobs = await apiGet<{ jobs: JobSummary[] }>(page, "/api/jobs");
    jobId = jobs.jobs.find((j) => j.title === jobTitle)!.id;
    await page.goto(`${t.url}/jobs/${jobId}`);
    const region = drawingsRegion(page);
    await visible(region.getByText("No drawings yet"));
    await shot(page, "drawings-1-job-empty-desktop");

    await region.getByRole("button", { name: "Upload drawing" }).click();
    const form = page.getByRole("form", { name: "Upload drawing" });
    await visible(form);
    const file = form.getByLabel("File", { exact: true });
    expect(await file.getAttribute("accept")).toContain("application/pdf");

    // Checked in the browser first, in the server's words: too large, and SVG.
    // A path, not a buffer: a local browser reads the file itself (no 26 MB over the protocol).
    const big = path.join(
      fs.mkdtempSync(path.join(os.tmpdir(), "sitecue-")),
      "site-survey.pdf",
    );
    fs.writeFileSync(big, Buffer.alloc(26 * 1024 * 1024, 0x25));
    await file.setInputFiles(big);
    fs.rmSync(path.dirname(big), { recursive: true, force: true });
    await visible(
      form.getByText("site-survey.pdf is larger than the 25 MB limit."),
    );
    await file.setInputFiles({
      name: "elevation.svg",
      mimeType: "image/svg+xml",
      buffer: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'),
    });
    await visible(form.getByText(/elevation\.svg is an SVG image/));

    // A file the browser cannot judge goes to the server, which sniffs it and says why not.
    await file.setInputFiles({
      name: "plan.pdf",
      mimeType: "application/pdf",
      buffer: Buffer.from("Alcove widths: 1040 and 1052 mm\n"),
    });
    await form.getByLabel("Title").fill(drawingTitle);
    for (const name of covingTasks)
      await form.getByRole("checkbox", { name, exact: true }).check();
    await form.getByRole("button", { name: "Upload Rev A" }).click();
    const refusal = form.getByRole("alert");
    await visible(refusal);
    expect(await refusal.innerText()).toMatch(
      /^plan\.pdf is not a PDF: .*Sitecue accepts PDF, PNG, JPEG, WebP, DXF\.$/,
    );
    await shot(page, "drawings-2-refused-desktop");
    // The browser logs the refused request itself; that one line is expected, nothing else.
    expect(owner.problems).toEqual([
      expect.stringContaining("status of 415 (Unsupported Media Type)"),
    ]);
    owner.problems.length = 0;
  });

  it("the owner uploads the elevation as Rev A for the coving tasks, shared with the plasterer and the electrician, with progress to 100 %", async () => {
    const { page } = owner;
    const region = drawingsRegion(page);
    const form = page.getByRole("form", { name: "Upload drawing" });
    const file = form.getByLabel("File", { exact: true });
    await file.setInputFiles({
      name: "elevation-alcoves-rev-a.pdf",
      mimeType: "application/pdf",
      buffer: revA,
    });
    await form
      .getByLabel("Note")
      .fill("Both alcoves as surveyed; coving line at 2350 mm.");
    const named = form.getByRole("group", { name: "Named trades on this job" });
    await named.getByRole("checkbox", { name: new RegExp(plasterer) }).check();
    await named
      .getByRole("checkbox", { name: new RegExp(electrician) })
      .check();
    await shot(page, "drawings-3-upload-form-desktop");

    await recordProgress(page);
    const unthrottle = await throttleUploads(page, 1_200_000);
    await form.getByRole("button", { name: "Upload Rev A" }).click();
    const bar = form.getByRole("progressbar", {
      name: "Uploading elevation-alcoves-rev-a.pdf",
    });
    await visible(bar);
    await page.waitForFunction(
      () =>
        Number(
          document
            .querySelector('[role="progressbar"]')
            ?.getAttribute("aria-valuenow") ?? 0,
        ) >= 20,
    );
    await shot(page, "drawings-4-uploading-desktop");
    await visible(
      region.getByText(`Rev A of “${drawingTitle}” is uploaded.`),
      30_000,
    );
    await unthrottle();
    const seen = await progressSeen(page);
    // Real progress: several steps in between, never backwards, ending at 100.
    expect(seen.filter((v) => v > 0 && v < 100).length).toBeGreaterThan(2);
    expect([...seen].sort((a, b) => a - b)).toEqual(seen);
    expect(seen.at(-1)).toBe(100);

    const item = region.getByRole("listitem").filter({
      has: page.getByRole("heading", { name: drawingTitle, exact: true }),
    });
    await visible(item.getByText("Drawing", { exact: true }));
    await visible(item.getByText("Rev A", { exact: true }));
    await visible(item.getByText(`For: ${covingTasks.join(", ")}`));
    await visible(item.getByText(`${plasterer} and ${electrician}`));
    await shot(page, "drawings-5-job-list-desktop");
    drawingId = new URL(
      (await item
        .getByRole("link", { name: drawingTitle, exact: true })
        .getAttribute("href"))!,
      t.url!,
    ).pathname.split("/")[4];
    expect(drawingId).toMatch(/^[0-9a-f-]{36}$/);
  });

  it("the drawing page draws the PDF with pdf.js, page by page, and shows the tasks' readiness as the programme does", async () => {
    const { page, problems } = owner;
    await drawingsRegion(page)
      .getByRole("link", { name: drawingTitle, exact: true })
      .click();
    await visible(
      page.getByRole("heading", { level: 1, name: drawingTitle, exact: true }),
    );
    const canvas = page.getByRole("img", {
      name: `${drawingTitle}, Rev A, page 1 of 2`,
    });
    await visible(canvas, 20_000);
    await expect.poll(() => inkedPixels(canvas)).toBeGreaterThan(50);
    await page.getByRole("button", { name: "Next page →" }).click();
    const page2 = page.getByRole("img", {
      name: `${drawingTitle}, Rev A, page 2 of 2`,
    });
    await visible(page2);
    await expect.poll(() => inkedPixels(page2)).toBeGreaterThan(200);
    await visible(page.getByText("Page 2 of 2"));
    expect(
      await page.getByRole("button", { name: "Next page →" }).isDisabled(),
    ).toBe(true);
    await page.getByRole("button", { name: "← Previous page" }).click();
    await visible(canvas);

    // Readiness from the programme (the programme API, not the drawing's own answer).
    const programme = await apiGet<ProgrammeResponse>(
      page,
      `/api/jobs/${jobId}/programme`,
    );
    const linked = page.getByRole("list", { name: "Linked tasks" });
    for (const name of covingTasks) {
      const task = programme.tasks.find((x) => x.name === name)!;
      const expected = expectedReadiness(programme, task.id);
      expect(expected).toMatch(/^(Clear to start from|Waiting on) /);
      const li = linked
        .getByRole("listitem")
        .filter({ has: page.getByRole("heading", { name, exact: true }) });
      await visible(li.getByText(expected, { exact: true }));
      // Both coving tasks are done at height: the caution from the task's brief is shown.
      const caution = cautionFor(task.party, task.hazards);
      expect(caution).toBeTruthy();
      await visible(li.getByText(caution!));
    }
    await visible(
      page
        .getByRole("region", { name: "Shared with" })
        .getByText(`${plasterer} and ${electrician}`),
    );
    await shot(page, "drawings-6-drawing-page-rev-a-desktop");
    expect(problems).toEqual([]);
  });

  it("the owner uploads Rev B; Rev B is current, Rev A stays in the history and downloads byte for byte", async () => {
    const { page, problems } = owner;
    await page.getByRole("button", { name: "Upload Rev B" }).click();
    const form = page.getByRole("form", { name: "Upload Rev B" });
    await form.getByLabel("File for Rev B").setInputFiles({
      name: "elevation-alcoves-rev-b.pdf",
      mimeType: "application/pdf",
      buffer: revB,
    });
    // The note is required: what changed.
    await form.getByRole("button", { name: "Upload Rev B" }).click();
    await visible(form.getByText("Say what changed in this revision"));
    await form
      .getByLabel("What changed")
      .fill("Left alcove 12 mm narrower at the top; scribe widened.");
    await recordProgress(page);
    const unthrottle = await throttleUploads(page, 1_200_000);
    await form.getByRole("button", { name: "Upload Rev B" }).click();
    await visible(
      form.getByRole("progressbar", {
        name: "Uploading elevation-alcoves-rev-b.pdf",
      }),
    );
    await visible(page.getByText("Rev B is uploaded and now current"), 30_000);
    await unthrottle();
    const seen = await progressSeen(page);
    expect(seen.filter((v) => v > 0 && v < 100).length).toBeGreaterThan(1);
    expect(seen.at(-1)).toBe(100);

    await visible(
      page.getByRole("img", { name: `${drawingTitle}, Rev B, page 1 of 2` }),
      20_000,
    );
    const revisions = page.getByRole("list", {
      name: "Revisions, newest first",
    });
    const items = revisions.getByRole("listitem");
    expect(await items.count()).toBe(2);
    await visible(items.nth(0).getByText("Rev B", { exact: true }));
    await visible(items.nth(0).getByText("Current", { exact: true }));
    await visible(items.nth(1).getByText("Rev A", { exact: true }));
    await visible(items.nth(1).getByText("elevation-alcoves-rev-a.pdf"));

    const [download] = await Promise.all([
      page.waitForEvent("download"),
      items.nth(1).getByRole("link", { name: "Download Rev A" }).click(),
    ]);
    expect(download.suggestedFilename()).toBe("elevation-alcoves-rev-a.pdf");
    const got = fs.readFileSync((await download.path())!);
    expect(got.equals(revA)).toBe(true);

    // An earlier revision can be looked at again.
    await items.nth(1).getByRole("button", { name: "Show Rev A" }).click();
    await visible(
      page.getByRole("img", { name: `${drawingTitle}, Rev A, page 1 of 2` }),
    );
    await visible(page.getByText("An earlier revision: Rev B is current."));
    await shot(page, "drawings-7-drawing-page-rev-b-desktop");

    const detail = await apiGet<DrawingDetail>(
      page,
      `/api/drawings/${drawingId}`,
    );
    expect(detail.revisions.map((r) => r.letter)).toEqual(["B", "A"]);
    expect(await axeSeriousOrWorse(page)).toEqual([]);
    expect(problems).toEqual([]);
  });

  it("the plasterer on a phone sees the drawing and adds a template photo to their own task", async () => {
    const { page, problems } = await signInAs(demoAccounts.trade.email, phone);
    await page.goto(`${t.url}/jobs/${jobId}`);
    const region = drawingsRegion(page);
    const item = region.getByRole("listitem").filter({
      has: page.getByRole("heading", { name: drawingTitle, exact: true }),
    });
    await visible(item.getByText("Rev B", { exact: true }));
    // Sharing is the workshop's business: a trade is not shown it.
    expect(await item.getByText("Shared with").count()).toBe(0);
    await shot(page, "drawings-8-job-plasterer-phone");

    await item.getByRole("link", { name: drawingTitle, exact: true }).click();
    await visible(
      page.getByRole("img", { name: `${drawingTitle}, Rev B, page 1 of 2` }),
      20_000,
    );
    expect(await page.getByRole("button", { name: /Upload Rev/ }).count()).toBe(
      0,
    );
    expect(
      await page.getByRole("region", { name: "Shared with" }).count(),
    ).toBe(0);
    // The trade may not read the workshop's programme: the owner's session reads it.
    const programme = await apiGet<ProgrammeResponse>(
      owner.page,
      `/api/jobs/${jobId}/programme`,
    );
    const linked = page.getByRole("list", { name: "Linked tasks" });
    for (const name of covingTasks) {
      const task = programme.tasks.find((x) => x.name === name)!;
      await visible(
        linked
          .getByRole("listitem")
          .filter({ has: page.getByRole("heading", { name, exact: true }) })
          .getByText(expectedReadiness(programme, task.id), { exact: true }),
      );
    }
    const width = await page.evaluate(
      () => document.documentElement.scrollWidth,
    );
    expect(width).toBeLessThanOrEqual(phone.width);
    await shot(page, "drawings-9-drawing-page-plasterer-phone");
    expect(await axeSeriousOrWorse(page)).toEqual([]);

    await page.getByRole("link", { name: `← ${jobTitle}` }).click();
    await region.getByRole("button", { name: "Add template or photo" }).click();
    const form = page.getByRole("form", { name: "Add template or photo" });
    const input = form.getByLabel("Photo or file");
    // HTML Media Capture: the phone offers its back camera.
    expect(await input.getAttribute("capture")).toBe("environment");
    expect(await input.getAttribute("accept")).toBe("image/*,application/pdf");
    // Only template and site photo, only their own tasks.
    const kinds = form.getByRole("group", { name: "Kind" }).getByRole("radio");
    expect(await kinds.count()).toBe(2);
    const tasks = form
      .getByRole("group", { name: "For your task" })
      .getByRole("checkbox");
    expect(await tasks.count()).toBe(covingTasks.length);
    const taskNames = await form
      .getByRole("group", { name: "For your task" })
      .locator("label")
      .allInnerTexts();
    expect(taskNames.map((s) => s.trim()).sort()).toEqual(
      [...covingTasks].sort(),
    );

    const photo = await sharp({
      create: {
        width: 1600,
        height: 1200,
        channels: 3,
        background: { r: 214, g: 205, b: 188 },
        // Noise, like a photo of a plaster wall, so the JPEG is big enough to watch it upload.
        noise: { type: "gaussian", mean: 190, sigma: 40 },
      },
    })
      .composite([
        {
          input: Buffer.from(
            '<svg xmlns="http://www.w3.org/2000/svg" width="1600" height="1200"><path d="M0 300 C 400 260, 800 380, 1600 320 L1600 420 C 800 470, 400 360, 0 400 Z" fill="#8A6A4F"/></svg>',
          ),
        },
      ])
      .jpeg({ quality: 92 })
      .toBuffer();
    await input.setInputFiles({
      name: "coving-template.jpg",
      mimeType: "image/jpeg",
      buffer: photo,
    });
    await form.getByRole("radio", { name: "Template" }).check();
    await form
      .getByLabel("Note")
      .fill("Ogee profile traced at the chimney breast, left alcove.");
    await form.getByRole("checkbox", { name: "Template coving" }).check();
    await recordProgress(page);
    const unthrottle = await throttleUploads(page, 400_000);
    await form.getByRole("button", { name: "Add to my task" }).click();
    await visible(
      form.getByRole("progressbar", { name: "Uploading coving-template.jpg" }),
    );
    await page.waitForFunction(
      () =>
        Number(
          document
            .querySelector('[role="progressbar"]')
            ?.getAttribute("aria-valuenow") ?? 0,
        ) >= 20,
    );
    await shot(page, "drawings-10-uploading-plasterer-phone");
    await visible(
      region.getByText(
        "“Template for Template coving” is added to your task; the workshop sees it.",
      ),
      30_000,
    );
    await unthrottle();
    const seen = await progressSeen(page);
    expect(seen.filter((v) => v > 0 && v < 100).length).toBeGreaterThan(1);
    expect(seen.at(-1)).toBe(100);

    const mine = region.getByRole("listitem").filter({
      has: page.getByRole("heading", { name: "Template for Template coving" }),
    });
    await visible(mine.getByText("Template", { exact: true }));
    await visible(mine.getByText("For: Template coving"));
    // The server made a thumbnail; the list shows it.
    const thumb = mine.locator("img");
    await expect
      .poll(() => thumb.evaluate((el) => (el as HTMLImageElement).naturalWidth))
      .toBeGreaterThan(0);
    await shot(page, "drawings-11-template-added-plasterer-phone");

    await mine
      .getByRole("link", { name: "Template for Template coving" })
      .click();
    const img = page.getByRole("img", {
      name: /^Template for Template coving, Rev A: Ogee profile/,
    });
    await visible(img);
    await expect
      .poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth))
      .toBeGreaterThan(0);
    expect(
      await page
        .getByRole("link", { name: "Open full size" })
        .getAttribute("href"),
    ).toMatch(/\/revisions\/A\/file\?inline=1$/);
    await shot(page, "drawings-12-template-page-plasterer-phone");
    expect(problems).toEqual([]);

    // The workshop sees the plasterer's template on the job.
    await owner.page.goto(`${t.url}/jobs/${jobId}`);
    await visible(
      drawingsRegion(owner.page).getByRole("heading", {
        name: "Template for Template coving",
      }),
    );
    expect(owner.problems).toEqual([]);
  });

  it("the customer sees the elevation only once the owner shares it with them", async () => {
    const rosa = await signInAs(demoAccounts.customer.email, phone);
    await rosa.page.goto(`${t.url}/jobs/${jobId}`);
    const region = drawingsRegion(rosa.page);
    // Shared with two trades; the plasterer's template goes to the workshop only.
    await visible(region.getByText("No drawings yet"));
    expect(await region.getByRole("button").count()).toBe(0);

    const { page } = owner;
    await page.goto(`${t.url}/jobs/${jobId}/drawings/${drawingId}`);
    const sharing = page.getByRole("region", { name: "Shared with" });
    await sharing.getByRole("button", { name: "Change sharing" }).click();
    const form = page.getByRole("form", { name: "Change sharing" });
    await form
      .getByRole("group", { name: "The customer" })
      .getByRole("checkbox")
      .check();
    await form.getByRole("button", { name: "Save sharing" }).click();
    await visible(
      sharing.getByText(`${plasterer}, ${electrician} and the customer`),
    );
    await shot(page, "drawings-13-shared-with-customer-desktop");

    await rosa.page.reload();
    const item = region.getByRole("listitem").filter({
      has: rosa.page.getByRole("heading", {
        name: drawingTitle,
        exact: true,
      }),
    });
    await visible(item.getByText("Rev B", { exact: true }));
    expect(await region.getByRole("listitem").count()).toBe(1);
    await item.getByRole("link", { name: drawingTitle, exact: true }).click();
    await visible(
      rosa.page.getByRole("img", {
        name: `${drawingTitle}, Rev B, page 1 of 2`,
      }),
      20_000,
    );
    // A booking is a visit to the customer: a sent one reads "To be confirmed".
    const linked = rosa.page.getByRole("list", { name: "Linked tasks" });
    const template = linked.getByRole("listitem").filter({
      has: rosa.page.getByRole("heading", { name: "Template coving" }),
    });
    await visible(template.getByText("Visit:"));
    await visible(template.getByText("To be confirmed"));
    await shot(rosa.page, "drawings-14-drawing-page-customer-phone");
    expect(rosa.problems).toEqual([]);
    expect(owner.problems).toEqual([]);
  });

  it("a DXF drawing is offered as a download only", async () => {
    const { page, problems } = owner;
    await page.goto(`${t.url}/jobs/${jobId}`);
    const region = drawingsRegion(page);
    await region.getByRole("button", { name: "Upload drawing" }).click();
    const form = page.getByRole("form", { name: "Upload drawing" });
    const dxf = sampleDxf();
    await form.getByLabel("File", { exact: true }).setInputFiles({
      name: "plan-alcoves.dxf",
      mimeType: "application/octet-stream",
      buffer: dxf,
    });
    await form.getByLabel("Title").fill("Plan, alcoves (CAD)");
    await form
      .getByRole("checkbox", { name: "Fix carcasses & scribes", exact: true })
      .check();
    await form.getByRole("button", { name: "Upload Rev A" }).click();
    await region
      .getByRole("link", { name: "Plan, alcoves (CAD)" })
      .click({ timeout: 20_000 });
    const download = page.getByRole("link", { name: "Download (DXF)" });
    await visible(download);
    expect(await download.getAttribute("href")).toMatch(
      /\/revisions\/A\/file$/,
    );
    await visible(page.getByText(/DXF drawings open in a CAD program/));
    expect(await page.locator("canvas").count()).toBe(0);
    // The carcasses are fixed to the wall: the tall-unit caution comes with the task.
    const programme = await apiGet<ProgrammeResponse>(
      page,
      `/api/jobs/${jobId}/programme`,
    );
    const carcasses = programme.tasks.find(
      (x) => x.name === "Fix carcasses & scribes",
    )!;
    await visible(
      page.getByText(cautionFor(carcasses.party, carcasses.hazards)!),
    );
    await visible(
      page.getByText(expectedReadiness(programme, carcasses.id), {
        exact: true,
      }),
    );
    await shot(page, "drawings-15-dxf-desktop");
    expect(problems).toEqual([]);
  });
});
