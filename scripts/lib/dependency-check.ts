/**
 * The dependency check, suite "dependencies" of `npm test`: Knip (pinned in the root package.json)
 * reads every workspace package as knip.jsonc describes it, Vue files, vitest and vite configs and
 * scripts included, and fails when a package declares a dependency that nothing imports or runs, or
 * imports or runs one it does not declare. A configuration hint fails it too, so an ignore entry that
 * no longer ignores anything is removed rather than left to hide a future mistake.
 */
import { spawnSync } from 'node:child_process';

export const DEPENDENCY_CHECK_COMMAND: readonly string[] = ['pnpm', 'exec', 'knip', '--dependencies', '--no-progress', '--treat-config-hints-as-errors'];

export interface DependencyIssue {
  /** The package.json (or source file) Knip names, relative to the checked folder. */
  readonly file: string;
  readonly kind: string;
  readonly name: string;
}

interface KnipJsonReport {
  issues: { file: string; [kind: string]: unknown }[];
}

/** Runs the check in `dir` (a checkout of this repository) and returns its exit code and issues. */
export function runDependencyCheck(dir: string): { status: number; issues: DependencyIssue[]; stderr: string } {
  const [command = 'pnpm', ...args] = DEPENDENCY_CHECK_COMMAND;
  const run = spawnSync(command, [...args, '--reporter', 'json'], { cwd: dir, encoding: 'utf8' });
  const issues: DependencyIssue[] = [];
  if (run.stdout.trim() !== '') {
    const report = JSON.parse(run.stdout) as KnipJsonReport;
    for (const entry of report.issues) {
      for (const [kind, list] of Object.entries(entry)) {
        if (!Array.isArray(list)) continue;
        for (const item of list as { name: string }[]) issues.push({ file: entry.file, kind, name: item.name });
      }
    }
  }
  return { status: run.status ?? 1, issues, stderr: run.stderr };
}
