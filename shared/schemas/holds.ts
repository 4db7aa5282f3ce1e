import { z } from 'zod';
import { idSchema, text } from './common';

// Legal holds: a matter-wide hold, or a hold on one custodian's documents. While a hold
// is active none of the documents it covers can be deleted or purged.

export const HOLD_REASON_MAX_LENGTH = 2000;

const holdReason = text()
  .trim()
  .min(1, 'is required: say why (e.g. the litigation hold notice or order)')
  .max(HOLD_REASON_MAX_LENGTH, `must be at most ${HOLD_REASON_MAX_LENGTH} characters`);

export const holdParams = z.object({ matterId: idSchema, holdId: idSchema });

export const setHoldSchema = z.object({
  /** The custodian the hold covers; omitted or null: the whole matter. */
  custodianId: idSchema.nullable().optional(),
  reason: holdReason,
});
export type SetHoldReq = z.infer<typeof setHoldSchema>;

export const releaseHoldSchema = z.object({ reason: holdReason });
export type ReleaseHoldReq = z.infer<typeof releaseHoldSchema>;

export interface LegalHold {
  id: number;
  /** null: the hold covers the whole matter. */
  custodian: { id: number; name: string } | null;
  reason: string;
  setBy: string | null;
  setAt: string;
  releasedBy: string | null;
  releasedAt: string | null;
  releaseReason: string | null;
  active: boolean;
}

export interface HoldsResponse {
  /** Active holds first, then released ones (newest first). */
  holds: LegalHold[];
}

export interface HoldResponse {
  hold: LegalHold;
}
