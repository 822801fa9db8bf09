/**
 * Coalesces redraw requests to at most one per animation frame: sample
 * batches may arrive faster than the screen refreshes, and uPlot's setData
 * is the expensive step.
 */
export type RequestFrame = (callback: () => void) => unknown;

export interface FrameGate {
  /** Asks for `draw` to run on the next frame; repeated asks in one frame collapse. */
  request(): void;
  /** Stops any pending frame from drawing. */
  cancel(): void;
}

export function createFrameGate(draw: () => void, requestFrame: RequestFrame): FrameGate {
  let pending = false;
  let cancelled = false;
  return {
    request() {
      if (pending || cancelled) return;
      pending = true;
      requestFrame(() => {
        pending = false;
        if (!cancelled) draw();
      });
    },
    cancel() {
      cancelled = true;
    },
  };
}
