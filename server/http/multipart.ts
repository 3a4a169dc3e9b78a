/**
 * Multipart bodies read with a hard size bound: the declared length is checked first,
 * and the stream is cut off at the bound whatever it declared, so an upload can never
 * make the server hold more than `maxBytes`.
 */
import { TesseraError } from "../errors";

export interface MultipartLimits {
  maxBytes: number;
  surface: string;
  /** The refusal of a body over the bound; the default names the limit. */
  tooLarge?: () => TesseraError;
  /** What a body that is not multipart/form-data is told. */
  notMultipart?: string;
}

export async function readMultipart(req: Request, limits: MultipartLimits): Promise<FormData> {
  const { maxBytes, surface } = limits;
  const type = req.headers.get("content-type") ?? "";
  if (!type.startsWith("multipart/form-data")) {
    throw new TesseraError("unsupported", surface, limits.notMultipart ?? `Send the form as multipart/form-data, not ${type || "an untyped body"}.`);
  }
  const tooLarge = limits.tooLarge ?? (() => new TesseraError("too_large", surface, `The upload is over the ${(maxBytes / 1048576).toFixed(0)} MB limit.`));
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge();
  const chunks: Uint8Array[] = [];
  let total = 0;
  const reader = req.body?.getReader();
  if (reader) {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        await reader.cancel();
        throw tooLarge();
      }
      chunks.push(value);
    }
  }
  try {
    return await new Response(Buffer.concat(chunks), { headers: { "content-type": type } }).formData();
  } catch (cause) {
    throw new TesseraError("bad_request", surface, "The multipart body could not be read.", { cause });
  }
}

/** The files of field `name`, as buffers with their given names (which are only labels). */
export async function formFiles(form: FormData, name: string): Promise<{ name: string; bytes: Buffer }[]> {
  const files = form.getAll(name).filter((v): v is File => typeof v !== "string");
  return Promise.all(files.filter((f) => f.size > 0).map(async (f) => ({ name: f.name || name, bytes: Buffer.from(await f.arrayBuffer()) })));
}
