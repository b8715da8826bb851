/**
 * Receiving one uploaded file over HTTP: multer in memory (nothing touches the disk), a size limit per route, UTF-8
 * text only. Every problem becomes an AppError before anything is stored: 413 PAYLOAD_TOO_LARGE naming the limit, or
 * 400 INVALID_FILE with "line N: field: reason" and `fields.file`. What the text means is for services/uploads.ts.
 */
import type { Request, Response } from "express";
import multer from "multer";
import { AppError } from "../errors";
import { invalidFile, type UploadedText } from "../services/uploads";

/**
 * Receives one multipart file in field `file` (plus text fields) within `maxBytes`.
 * @returns the file as text and the other form fields
 * @throws AppError 413 PAYLOAD_TOO_LARGE over the limit; 400 INVALID_FILE for a missing, binary or non-UTF-8 file
 */
export async function receiveUpload(req: Request, res: Response, maxBytes: number): Promise<{ file: UploadedText; fields: Record<string, unknown> }> {
  const middleware = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 10_000, parts: 12 } }).single("file");
  await new Promise<void>((resolve, reject) => {
    middleware(req, res, (error: unknown) => (error ? reject(toUploadError(error, maxBytes)) : resolve()));
  });
  const fields = (req.body ?? {}) as Record<string, unknown>;
  const raw = req.file;
  if (!raw) throw invalidFile('no file: send it as multipart/form-data in the field "file"');
  const fileName = raw.originalname || "upload";
  const dot = fileName.lastIndexOf(".");
  const extension = dot > 0 ? fileName.slice(dot + 1).toLowerCase() : "";
  return { file: { fileName, extension, text: decodeText(raw.buffer), bytes: raw.size }, fields };
}

function toUploadError(error: unknown, maxBytes: number): AppError {
  if (error instanceof multer.MulterError) {
    if (error.code === "LIMIT_FILE_SIZE") {
      const message = `The file is larger than the limit of ${formatBytes(maxBytes)} (${maxBytes} bytes).`;
      return new AppError("PAYLOAD_TOO_LARGE", message, { fields: { file: message } });
    }
    if (error.code === "LIMIT_UNEXPECTED_FILE") return invalidFile(`unexpected file field "${error.field ?? ""}": send one file in the field "file"`);
    return invalidFile(`the upload was refused (${error.message})`);
  }
  return invalidFile(`the upload is not valid multipart/form-data (${(error as Error)?.message ?? "unknown error"})`);
}

function formatBytes(n: number): string {
  return n % (1024 * 1024) === 0 ? `${n / (1024 * 1024)} MiB` : n % 1024 === 0 ? `${n / 1024} KiB` : `${n} bytes`;
}

/** UTF-8 text, refusing NUL bytes and invalid sequences (naming the line of the first one). */
function decodeText(buffer: Buffer): string {
  const lineAt = (byte: number) => 1 + buffer.subarray(0, byte).filter((b) => b === 0x0a).length;
  const nul = buffer.indexOf(0);
  if (nul >= 0) throw invalidFile("this is a binary file, not text", lineAt(nul), "file");
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(buffer);
  } catch {
    const loose = new TextDecoder("utf-8").decode(buffer);
    const at = loose.indexOf("\uFFFD");
    const line = 1 + (loose.slice(0, Math.max(at, 0)).match(/\n/g)?.length ?? 0);
    throw invalidFile("not UTF-8 text (save the file as UTF-8)", line, "file");
  }
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

