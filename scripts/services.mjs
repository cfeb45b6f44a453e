// Local stand-ins for outside services, started by scripts/start.mjs and scripts/test.mjs after
// the database. `startServices(env)` receives the environment the app will get and returns
// `{ env, stop }`: extra variables for the app (e.g. where to send mail) and how to shut down.
// Nothing is needed yet.

/** @param {Record<string, string | undefined>} _env */
export async function startServices(_env) {
  return { env: {}, stop: async () => {} };
}
