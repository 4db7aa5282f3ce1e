import type { AppContext } from '../context';
import { afterCoding } from './service';

/**
 * Called by the coding routes once a change is committed: may queue a retrain of the
 * learned ranking. A failure here is logged and never fails the coding itself.
 */
export async function afterCodingQuietly(ctx: AppContext, matterId: number): Promise<void> {
  try {
    await afterCoding(ctx, matterId);
  } catch (error) {
    ctx.logger.error({ err: error, matterId }, 'could not queue a retrain of the learned ranking');
  }
}
