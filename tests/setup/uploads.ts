import zlib from "node:zlib";
import sharp from "sharp";

// Sample files for upload tests, made here rather than checked in, so each is exactly what the
// test says it is.

/** A PNG of the given size (drawn by sharp), in a drawing-office blue. */
export function samplePng(width = 640, height = 400): Promise<Buffer> {
  return sharp({
    create: { width, height, channels: 3, background: "#1F5F8B" },
  })
    .png()
    .toBuffer();
}

/** A JPEG photo-like image of the given size. */
export function sampleJpeg(width = 1200, height = 900): Promise<Buffer> {
  return sharp({
    create: { width, height, channels: 3, background: "#8A6A4F" },
  })
    .jpeg({ quality: 70 })
    .toBuffer();
}

/**
 * A valid one-page PDF (ISO 32000-1 §7.5: header, objects, cross-reference table with exact byte
 * offsets, trailer) showing `title`. `padTo` adds an uncompressed comment stream so the file is at
 * least that many bytes (for upload-progress tests).
 */
export function samplePdf(title = "Elevation, alcoves", padTo = 0): Buffer {
  const text = title.replace(/[()\\]/g, "");
  const content = `BT /F1 24 Tf 72 720 Td (${text}) Tj ET`;
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
    `<< /Length ${content.length} >>\nstream\n${content}\nendstream`,
    "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
  ];
  const fixed = objects.reduce((n, o) => n + o.length, 0) + 400;
  if (padTo > fixed) {
    const pad = "%".padEnd(79, "x") + "\n";
    const body = pad.repeat(Math.ceil((padTo - fixed) / pad.length));
    objects.push(`<< /Length ${body.length} >>\nstream\n${body}\nendstream`);
  }
  let out = "%PDF-1.4\n%\u00e2\u00e3\u00cf\u00d3\n";
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(Buffer.byteLength(out, "latin1"));
    out += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = Buffer.byteLength(out, "latin1");
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const off of offsets)
    out += `${String(off).padStart(10, "0")} 00000 n \n`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, "latin1");
}

/** The start of a 64-bit Linux ELF executable (magic 7F 45 4C 46, System V ABI), padded. */
export function sampleElf(): Buffer {
  const b = Buffer.alloc(8192);
  Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]).copy(b, 0);
  b.writeUInt16LE(2, 16); // e_type: executable
  b.writeUInt16LE(0x3e, 18); // e_machine: x86-64
  b.writeUInt32LE(1, 20); // e_version
  return b;
}

/** A minimal ASCII DXF: a HEADER section and one LINE entity, then EOF. */
export function sampleDxf(): Buffer {
  const groups = [
    [999, "Alcove plinth outline"],
    [0, "SECTION"],
    [2, "HEADER"],
    [0, "ENDSEC"],
    [0, "SECTION"],
    [2, "ENTITIES"],
    [0, "LINE"],
    [8, "0"],
    [10, "0.0"],
    [20, "0.0"],
    [11, "880.0"],
    [21, "0.0"],
    [0, "ENDSEC"],
    [0, "EOF"],
  ] as const;
  return Buffer.from(
    groups
      .map(([code, value]) => `${String(code).padStart(3)}\n${value}\n`)
      .join(""),
    "ascii",
  );
}

/** An SVG with a script in it: the reason SVG is refused. */
export function sampleSvg(): Buffer {
  return Buffer.from(
    '<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script><rect width="10" height="10"/></svg>\n',
  );
}

/** A PNG of noise: it barely compresses, so its size is about width × height × 3 bytes (for size-limit tests). */
export function noisyPng(width = 300, height = 300): Promise<Buffer> {
  return sharp({
    create: {
      width,
      height,
      channels: 3,
      background: "#808080",
      noise: { type: "gaussian", mean: 128, sigma: 40 },
    },
  })
    .png({ compressionLevel: 0 })
    .toBuffer();
}

/**
 * A tiny PNG whose header claims `width` × `height` pixels (a "decompression bomb" shape): the
 * signature, an IHDR chunk (8-bit RGB), one IDAT holding a single deflated row, and IEND
 * (PNG spec, ISO/IEC 15948 §5.3, §11.2.2). Readers see the dimensions long before the data runs out.
 */
export function hugeDimensionPng(width = 20_000, height = 20_000): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const body = Buffer.concat([Buffer.from(type, "latin1"), data]);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(zlib.crc32(body));
    return Buffer.concat([len, body, crc]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // colour type: truecolour (RGB)
  const row = Buffer.alloc(1 + width * 3); // filter byte 0, then black pixels
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", ihdr),
    chunk("IDAT", zlib.deflateSync(row)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
}
