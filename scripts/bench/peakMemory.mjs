// Loaded with `node --import` by the benchmark: prints this process's peak resident memory (KiB,
// worker threads included) and its processor time (user + system seconds, all threads) on stderr at
// exit, as the last line, for the benchmark to read.
process.on("exit", () => {
  const usage = process.resourceUsage();
  const cpuSeconds = (usage.userCPUTime + usage.systemCPUTime) / 1e6;
  process.stderr.write(`\npeakMemoryKiB=${usage.maxRSS} cpuSeconds=${cpuSeconds}\n`);
});
