/** How a run ended, as the results step shows it. */
import type { Issue } from '../core/intake/types';
import type { WrittenSheet } from './actions';

export type RunOutcome =
  | {
      readonly kind: 'done';
      readonly written: readonly WrittenSheet[];
      /** Short plain lines: counts first, then the model's own summary when there is one. */
      readonly headline: readonly string[];
      readonly issues: readonly Issue[];
    }
  /** Intake found errors that stop the run. */
  | { readonly kind: 'blocked'; readonly issues: readonly Issue[] }
  | { readonly kind: 'cancelled' }
  /** Something failed outside the data (the host, a bug); the message says what. */
  | { readonly kind: 'failed'; readonly message: string };
