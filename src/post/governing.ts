/** The Kt values of the raiser that governs a series (src/post/settle.ts decides which). */
import type { KtKind } from './kt.js';
import type { Raiser } from './raisers.js';
import type { Settlement } from './settle.js';

export interface GoverningKt {
  /** the governing raiser's name, or null when no raiser has a Kt */
  raiser: string | null;
  /** the headline kind and value (given, remote, net, gross: the first not withheld) */
  kind: KtKind | null;
  value: number | null;
  /** the relative error band of the headline value (null without a series) */
  error: number | null;
  net: number | null;
  gross: number | null;
  remote: number | null;
}

/** The governing raiser's Kt values as settled; every field null when no raiser governs. */
export function findGoverningKt(s: Settlement, raisers: readonly Raiser[]): GoverningKt {
  if (s.governing < 0) return { raiser: null, kind: null, value: null, error: null, net: null, gross: null, remote: null };
  const r = s.raisers[s.governing];
  const get = (k: KtKind) => r.kt.find((q) => q.kind === k)?.value ?? null;
  const head = r.primary ? r.kt.find((q) => q.kind === r.primary)! : null;
  return { raiser: raisers[s.governing].name, kind: r.primary, value: head?.value ?? null, error: head?.error ?? null, net: get('net'), gross: get('gross'), remote: get('remote') };
}
