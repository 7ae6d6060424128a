// Entry of the embedded database's thread (pglite-client.ts): loads pglite-thread.ts through tsx's
// require hook (started with `--import tsx`), the way piscina loads the work pool's threads; tsx's
// import hook is not in place inside a worker.
require('./pglite-thread.ts');
