import { createHash } from 'node:crypto';
import type { DelayUnit } from '@/lib/design';
import { defaultSeed } from '@/lib/shared/item-bank-plan';

/** The settings that change a version's items (the design's amounts and currency are in its content). */
export type Presentation = { seed: number; delayUnit: DelayUnit; minGap: number };

/** A version's presentation settings with the defaults filled in (the version's seed, days, a gap of 2). */
export function presentationOf(hash: string, options: { seed?: number | null; delayUnit?: DelayUnit; minGap?: number }): Presentation {
  return { seed: options.seed ?? defaultSeed(hash), delayUnit: options.delayUnit ?? 'days', minGap: options.minGap ?? 2 };
}

/**
 * The item bank's id: 16 hex digits of SHA-256 over the version's hash and the settings that change
 * items. An export file, the calibration endpoint and a key carry it, so a request scored with
 * other items than the lab presented is recognised and refused instead of silently rescored.
 */
export function itemBankId(hash: string, presentation: Presentation): string {
  return createHash('sha256').update(`${hash}:${presentation.seed}:${presentation.delayUnit}:${presentation.minGap}`).digest('hex').slice(0, 16);
}
