import type { Applied, Intent } from '../../planner/intents.ts';

/**
 * How an element asks the planner for a change: it sends an intent up the tree as a `planner-intent`
 * event, and the planner (which holds the store) applies it while the event is being dispatched and
 * leaves the outcome on the event. So an element gets its answer at once ("that id is already used")
 * without holding the store itself.
 */
export interface IntentDetail {
  readonly intent: Intent;
  applied: Applied | undefined;
}

export type PlannerIntentEvent = CustomEvent<IntentDetail>;

export const INTENT_EVENT = 'planner-intent';

/** Send an intent from `from`; the outcome, or undefined when no planner is listening. */
export function sendIntent(from: EventTarget, intent: Intent): Applied | undefined {
  const detail: IntentDetail = { intent, applied: undefined };
  from.dispatchEvent(new CustomEvent<IntentDetail>(INTENT_EVENT, { detail, bubbles: true, composed: true }));
  return detail.applied;
}

declare global {
  interface HTMLElementEventMap {
    'planner-intent': PlannerIntentEvent;
  }
}
