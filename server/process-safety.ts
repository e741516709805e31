// The last line of defence: a promise rejection that nothing handled is logged, not allowed to end
// the process (Node's default), so one forgotten cleanup path cannot take the shelf down for
// everyone. Cleanup code still catches its own errors; this only catches what slipped through.
let installed = false;

export function keepRunningOnUnhandledRejections(log: (message: string, reason: unknown) => void = console.error): void {
  if (installed) return;
  installed = true;
  process.on('unhandledRejection', (reason) => log('rigshelf: a promise rejection was not handled (the server keeps running):', reason));
}
