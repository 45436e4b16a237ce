// Loaded into a build by the bench (node --import): on exit, the process's peak resident set
// (all its threads) as Node reports it, in KiB, on a line of its own.
process.on('exit', () => {
  process.stderr.write(`\nbench-maxrss-kib ${process.resourceUsage().maxRSS}\n`);
});
