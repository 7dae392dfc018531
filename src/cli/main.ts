#!/usr/bin/env node
/**
 * The `fieldbook` command: a thin shell over spec (parse, validate), archive (hash, records)
 * and the engine. Verbs: run, check, compute, build, verify, new; `--help` on each.
 *
 * GLIBC_TUNABLES=glibc.malloc.hugetlb=1 in the npm scripts lets the large ERI store be backed
 * by huge pages, which cuts its first-touch page faults.
 */
import { parseArgs } from "node:util";
import { HELP, VERBS } from "./help.ts";

async function main(argv: string[]): Promise<number> {
  const [verb, ...rest] = argv;
  if (!verb || verb === "--help" || verb === "-h" || verb === "help") {
    process.stdout.write(HELP.main);
    return verb ? 0 : 2;
  }
  if (!VERBS.includes(verb)) {
    process.stderr.write(`fieldbook: unknown command "${verb}"\n${HELP.main}`);
    return 2;
  }
  if (rest.includes("--help") || rest.includes("-h")) {
    process.stdout.write(HELP[verb]);
    return 0;
  }
  const commands = await import("./commands.ts");
  switch (verb) {
    case "run": {
      const { values, positionals } = parseArgs({ args: rest, allowPositionals: true, options: { json: { type: "boolean" } } });
      if (positionals.length !== 1) return usage(verb);
      return commands.runCommand(positionals[0], { json: values.json ?? false });
    }
    case "check": {
      const { positionals } = parseArgs({ args: rest, allowPositionals: true, options: {} });
      return commands.checkCommand(positionals);
    }
    case "compute":
    case "build": {
      const { values } = parseArgs({ args: rest, allowPositionals: false, options: { jobs: { type: "string" }, shard: { type: "string" } } });
      const jobs = values.jobs === undefined ? undefined : Number(values.jobs);
      if (jobs !== undefined && !(Number.isInteger(jobs) && jobs >= 1)) return fail(`--jobs needs a positive integer, got "${values.jobs}"`);
      let shard: [number, number] | undefined;
      if (values.shard !== undefined) {
        const m = /^(\d+)\/(\d+)$/.exec(values.shard);
        if (!m || +m[1] < 1 || +m[1] > +m[2]) return fail(`--shard needs K/N with 1 ≤ K ≤ N, got "${values.shard}"`);
        shard = [+m[1], +m[2]];
      }
      const code = await commands.computeCommand({ jobs, shard });
      if (verb === "compute" || code !== 0) return code;
      return commands.buildSite();
    }
    case "verify": {
      const { positionals } = parseArgs({ args: rest, allowPositionals: true, options: {} });
      return commands.verifyCommand(positionals);
    }
    case "new": {
      const { values, positionals } = parseArgs({
        args: rest, allowPositionals: true,
        options: { out: { type: "string" }, title: { type: "string" }, basis: { type: "string" }, charge: { type: "string" } },
      });
      if (positionals.length !== 1) return usage(verb);
      return commands.newCommand(positionals[0], values);
    }
  }
  return usage(verb);
}

function usage(verb: string): number {
  process.stderr.write(HELP[verb]);
  return 2;
}

function fail(message: string): number {
  process.stderr.write(`fieldbook: ${message}\n`);
  return 2;
}

/**
 * Exit after a short idle pause: background JIT compile jobs still in flight when the process
 * shuts down can deadlock Node's exit (nodejs/node#54918; it hung about one run in a hundred
 * here). Idle, they finish first. 30 ms is nothing next to a calculation.
 */
function exitAfterIdle(code: number): void {
  setTimeout(() => process.exit(code), 30);
}

main(process.argv.slice(2)).then(
  (code) => exitAfterIdle(code),
  (e) => {
    process.stderr.write(`fieldbook: internal error: ${e instanceof Error ? e.stack : String(e)}\n`);
    exitAfterIdle(70);
  },
);
