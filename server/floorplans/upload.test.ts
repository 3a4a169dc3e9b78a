import { describe, expect, it } from "vitest";
import { isTesseraError } from "../errors";
import { parseUpload, readUploadForm, uploadKind } from "./upload";

const opts = { tileM: 0.3, pixelsPerTile: 1, threshold: 128 };

async function failureOf(run: () => unknown): Promise<{ status: number; message: string }> {
  try {
    await run();
  } catch (err) {
    if (isTesseraError(err)) return { status: err.status, message: err.message };
    throw err;
  }
  throw new Error("expected a refusal");
}

function formRequest(parts: Record<string, Blob | string>, headers: Record<string, string> = {}): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(parts)) form.set(k, v);
  return new Request("http://tessera.test/api/floorplans", { method: "POST", body: form, headers });
}

describe("readUploadForm", () => {
  it("reads the file part and the text fields", async () => {
    const { file, fields } = await readUploadForm(formRequest({ file: new File(["0,1\n"], "aisle.csv", { type: "text/csv" }), name: "Aisle", tileM: "0.5" }), "floorplans");
    expect(file).toMatchObject({ filename: "aisle.csv", mime: "text/csv" });
    expect(new TextDecoder().decode(file.bytes)).toBe("0,1\n");
    expect(fields).toEqual({ name: "Aisle", tileM: "0.5" });
  });

  it("stops reading a body without a declared length once it passes the limit", async () => {
    let sent = 0;
    const chunk = new Uint8Array(256 * 1024);
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const req = new Request("http://tessera.test/api/floorplans", { method: "POST", body, headers: { "content-type": "multipart/form-data; boundary=x" }, duplex: "half" } as RequestInit);
    expect(await failureOf(() => readUploadForm(req, "floorplans"))).toEqual({ status: 413, message: "The upload is larger than the 2 MB limit." });
    expect(sent).toBeLessThan(3 * 1024 * 1024);
  });

  it("refuses a declared length over the limit, a body that is not multipart, and a form without a file", async () => {
    const declared = new Request("http://tessera.test/", { method: "POST", body: "x", headers: { "content-type": "multipart/form-data; boundary=x", "content-length": String(5 * 1024 * 1024) } });
    expect((await failureOf(() => readUploadForm(declared, "floorplans"))).status).toBe(413);
    const json = new Request("http://tessera.test/", { method: "POST", body: "{}", headers: { "content-type": "application/json" } });
    expect((await failureOf(() => readUploadForm(json, "floorplans"))).status).toBe(415);
    expect(await failureOf(() => readUploadForm(formRequest({ name: "No file" }), "floorplans"))).toEqual({ status: 400, message: "Choose a file to import." });
  });
});

describe("uploadKind and parseUpload", () => {
  const file = (bytes: Uint8Array | string, filename: string, mime = "application/octet-stream") => ({ filename, mime, bytes: typeof bytes === "string" ? new TextEncoder().encode(bytes) : bytes });

  it("tells the kind from the bytes, not the name", () => {
    expect(uploadKind(file(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0]), "plan.dat"), "floorplans")).toBe("png");
    expect(uploadKind(file("P2\n1 1\n255\n0\n", "scan.txt"), "floorplans")).toBe("pgm");
    expect(uploadKind(file("0,0\n0,1\n", "grid.png.csv"), "floorplans")).toBe("text");
  });

  it("answers 422 saying where a grid fails, and when no tile is free", async () => {
    expect(await failureOf(() => parseUpload(file("0 0 0\n0 0 0 0\n", "hall.txt"), opts, "floorplans"))).toEqual({
      status: 422,
      message: "hall.txt: ragged row: 4 cells where row 0 has 3 at line 2, row 1, col 3.",
    });
    expect(await failureOf(() => parseUpload(file("P2\n2 1\n255\n0 10\n", "dark.pgm"), opts, "floorplans"))).toEqual({ status: 422, message: "dark.pgm: no free tile — all 1 × 2 tiles are blocked." });
    const { plan, kind } = parseUpload(file("P2\n2 1\n255\n0 10\n", "dark.pgm"), { ...opts, threshold: 5 }, "floorplans");
    expect(kind).toBe("pgm");
    expect(Array.from(plan.blocked)).toEqual([1, 0]);
  });
});
