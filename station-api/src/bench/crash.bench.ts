/*
 * `npm run bench:crash -w station-api` (after `npm run build`): the crash harness of
 * test/crash-harness.e2e-spec.ts with 100 SIGKILLs (CRASH_KILLS to change), printing its figures:
 * runs started and interrupted, measurements checked, how often the pty fixture was found powered after a
 * kill and read back off after a start-up, and the restart time (server start to first answer).
 */
import { runCrashHarness } from './crash-harness';

function pct(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

async function main(): Promise<void> {
  const kills = Number(process.env.CRASH_KILLS ?? 100);
  const t0 = Date.now();
  const r = await runCrashHarness({ kills, seed: Number(process.env.CRASH_SEED ?? 1), log: (l) => console.log(l) });
  const restarts = [...r.restartMs].sort((a, b) => a - b);
  const mean = restarts.reduce((s, x) => s + x, 0) / restarts.length;
  console.log(`\nkills ${r.kills}, wall ${((Date.now() - t0) / 1000).toFixed(0)} s`);
  console.log(`runs started ${r.runsStarted}, finished ${r.runsFinished}, interrupted and closed at restart ${r.runsInterrupted}`);
  console.log(`measurements announced before a kill and found unchanged: ${r.measurementsChecked}`);
  console.log(`pty fixture found powered after a kill: ${r.ptyLeftPowered}; read back off after a start-up: ${r.ptyCheckedOff}`);
  console.log(
    `restart to first answer (n=${restarts.length}): median ${pct(restarts, 50)} ms, mean ${mean.toFixed(0)} ms, p95 ${pct(restarts, 95)} ms, max ${restarts[restarts.length - 1]} ms`,
  );
  console.log(`problems: ${r.problems.length}`);
  for (const p of r.problems) console.log(`  ${p}`);
  process.exit(r.problems.length ? 1 : 0);
}

void main();
