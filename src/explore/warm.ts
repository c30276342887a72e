import { importances } from "../interest/importance.js";
import type { Session } from "./session.js";
import type { ExploreState } from "./state.js";
import { fitOf, update } from "./update.js";

/**
 * Fits, in a quiet moment after the first screen, the views the first keys are likely to ask for,
 * without showing them; the session remembers each fit, so those keys cost no fit. Changes no state:
 * a screen is the same with or without it.
 * - The current view under every other importance: the first fit by an importance computes its
 *   a-priori importance over the whole tree (tens of milliseconds on a million nodes), which would
 *   otherwise fall on the first `i`.
 * - The views one and two Downs away (the next shown nodes under the cursor, so a focus below the
 *   root): the views so far focus on the root alone, so the fit's code for a focus (the walks up from
 *   it, the interest near it, the order's comparisons) has not run yet; run now, the engine has
 *   compiled and optimised it before the first move that needs it (on a million nodes the first such
 *   fit took 10 to 20 ms of CPU, later ones about 1). With the current view, that is the four fits
 *   the session remembers.
 */
export function warmFits(session: Session, state: ExploreState): void {
  for (const importance of importances)
    if (importance !== state.spec.importance)
      fitOf(session, { ...state.spec, importance }, state.rows, state.cols);
  if (state.mode.kind !== "browse") return;
  const down = update(session, state, { name: "down" });
  update(session, down, { name: "down" });
}
