// Preloaded (`node --import`) into app processes by server/infra/supervise.test.ts, so a test can
// make a real app process hit the two faults that happen outside any request:
//   SIGUSR2  → a promise rejects and nothing handles it;
//   SIGWINCH → an exception is thrown from a timer, outside any request.
process.on("SIGUSR2", () => {
  void Promise.reject(new Error("a promise nobody awaited (test fault)"));
});
process.on("SIGWINCH", () => {
  setTimeout(() => {
    throw new Error("thrown outside any request (test fault)");
  });
});
