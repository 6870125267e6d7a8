/**
 * The file of one finished sweep case, DIR/cases/<key>.json: the case's row, the signature of
 * the model and options it was solved with, and a SHA-256 checksum over both. A resumed sweep
 * reuses a case only when its file reads back whole: valid JSON, every field of the row of the
 * right kind, the checksum matching. A file that was edited, truncated or damaged is solved
 * again, never trusted.
 */
import { createHash } from 'node:crypto';
import { z } from 'zod';
import type { CaseRow } from './solve-case.js';

const finiteOrNull = z.number().finite().nullable();

/** What a case row must hold to be reused (the shape of CaseRow). */
const CaseRowSchema = z.strictObject({
  key: z.string(),
  values: z.record(z.string(), z.number().finite()),
  status: z.string(),
  ktNet: finiteOrNull,
  ktGross: finiteOrNull,
  error: finiteOrNull,
  peak: z.number().finite(),
  peakX: z.number().finite(),
  peakY: z.number().finite(),
  feature: z.string(),
  dofs: z.number().int().nonnegative(),
  meshes: z.number().int().nonnegative(),
  chartKt: finiteOrNull,
  chartId: z.string().nullable(),
  timeMs: z.number().finite(),
});

const CaseFileSchema = z.strictObject({ signature: z.string(), row: CaseRowSchema, checksum: z.string() });

function checksumOf(signature: string, row: CaseRow): string {
  return 'sha256:' + createHash('sha256').update(JSON.stringify({ signature, row })).digest('hex');
}

/** The text of a case file. */
export function encodeCaseFile(signature: string, row: CaseRow): string {
  return JSON.stringify({ signature, row, checksum: checksumOf(signature, row) }, null, 2) + '\n';
}

/** The row of a case file, or why it cannot be reused. */
export function decodeCaseFile(text: string): { ok: true; signature: string; row: CaseRow } | { ok: false; why: string } {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    return { ok: false, why: 'it is not JSON' };
  }
  const parsed = CaseFileSchema.safeParse(data);
  if (!parsed.success) {
    const i = parsed.error.issues[0];
    return { ok: false, why: `${i.path.join('.') || 'the file'}: ${i.message}` };
  }
  const { signature, row, checksum } = parsed.data;
  if (checksum !== checksumOf(signature, row as CaseRow)) return { ok: false, why: 'its checksum does not match its content (it was edited or damaged)' };
  return { ok: true, signature, row: row as CaseRow };
}
