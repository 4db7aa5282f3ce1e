import type { Transaction } from 'kysely';
import { createDefaultCodes } from '../codes/defaults';
import type { Database } from '../db/schema';

/** A step run inside the transaction that creates a matter (e.g. the default code set). */
export type MatterCreatedStep = (trx: Transaction<Database>, matterId: number) => Promise<void>;

/**
 * Steps every new matter gets, in order, from the admin screen and the demo seed alike.
 * Features add theirs here, e.g. the codes feature's default code set.
 */
export const matterCreatedSteps: MatterCreatedStep[] = [createDefaultCodes];
