// Loaded with `node --import` by the benchmark: prints this process's peak resident memory (KiB,
// worker threads included) on stderr at exit, as the last line, for the benchmark to read.
process.on("exit", () => {
  process.stderr.write(`\npeakMemoryKiB=${process.resourceUsage().maxRSS}\n`);
});
