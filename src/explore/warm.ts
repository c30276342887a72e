import { importances } from "../interest/importance.js";
import type { Session } from "./session.js";
import type { ExploreState } from "./state.js";
import { fitOf } from "./update.js";

/**
 * Fits the current view under every other importance once, in a quiet moment after the first screen:
 * the first fit by an importance computes its a-priori importance over the whole tree (tens of
 * milliseconds on a million nodes), which would otherwise fall on the first `i`. The fit is also
 * remembered by the session, so an `i` pressed before any move costs nothing. Changes no state: a
 * screen is the same with or without it.
 */
export function warmImportances(session: Session, state: ExploreState): void {
  for (const importance of importances)
    if (importance !== state.spec.importance)
      fitOf(session, { ...state.spec, importance }, state.rows, state.cols);
}
