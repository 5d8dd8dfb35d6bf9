let lastTurn = 0;

/**
 * Lets pending events run (a signal's handler, timers) when `everyMilliseconds` have passed
 * since the last turn. A sampler whose likelihood runs on this thread awaits only settled
 * promises, which never hand the event loop a turn; called once per step, this lets SIGTERM and
 * SIGINT be seen within a step. It draws nothing, so results do not depend on it.
 */
export async function eventLoopTurn(everyMilliseconds = 50): Promise<void> {
  const now = performance.now();
  if (now - lastTurn < everyMilliseconds) return;
  lastTurn = now;
  await new Promise<void>((resolve) => { setImmediate(resolve); });
}
