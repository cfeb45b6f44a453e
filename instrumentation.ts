// Next's start-up hook: power runs left queued or running by a server that stopped are marked
// interrupted (with a message and a restart button) instead of showing progress forever.
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  try {
    const { markInterruptedRuns } = await import('./lib/server/services/power-runner');
    // a live server beats every 2 s; a run silent for 6 s belongs to a server that is gone
    const marked = await markInterruptedRuns(6000);
    if (marked > 0) console.log(`[switchback] marked ${marked} power run(s) interrupted by the last restart`);
  } catch (error) {
    // a database that is down at start-up must not stop the server; runs are re-checked when read
    console.warn('[switchback] could not check for interrupted power runs at start-up:', error instanceof Error ? error.message : error);
  }
  // Real rewards: the payout scheduler sends due payouts from this server process (it tolerates a
  // database that is down: each tick logs and tries again).
  const { startPayoutScheduler } = await import('./lib/server/services/payouts-scheduler');
  startPayoutScheduler();
}
