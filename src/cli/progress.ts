/**
 * Progress for people: on a terminal, one live line per running calculation (its SCF
 * iteration, energy and ΔE) under an overall bar (cli-progress); elsewhere (CI, pipes) plain
 * lines, one when a calculation starts and one when it ends.
 */
import cliProgress from "cli-progress";

export interface ProgressEvent {
  id: string;
  kind: "start" | "iteration" | "stage" | "done" | "failed";
  text?: string;
}

export interface Progress {
  update(e: ProgressEvent): void;
  stop(): void;
}

export function createProgress(total: number, stream: NodeJS.WriteStream = process.stderr): Progress {
  if (!stream.isTTY || process.env.CI) return plainProgress(total, stream);
  const multi = new cliProgress.MultiBar(
    { clearOnComplete: false, hideCursor: true, format: " {bar} {value}/{total} {label}", barsize: 24, stream },
    cliProgress.Presets.shades_classic,
  );
  const overall = multi.create(total, 0, { label: "calculations" });
  const lines = new Map<string, cliProgress.SingleBar>();
  let done = 0;
  return {
    update(e) {
      if (e.kind === "start") {
        lines.set(e.id, multi.create(1, 0, { label: `${e.id}: starting` }));
        return;
      }
      const line = lines.get(e.id);
      if (e.kind === "iteration" || e.kind === "stage") {
        line?.update(0, { label: `${e.id}: ${e.text ?? ""}` });
        return;
      }
      done++;
      overall.update(done);
      if (line) {
        line.update(1, { label: `${e.id}: ${e.kind === "done" ? "done" : "FAILED"} ${e.text ?? ""}` });
        line.stop();
      }
    },
    stop() {
      multi.stop();
    },
  };
}

function plainProgress(total: number, stream: NodeJS.WriteStream): Progress {
  let done = 0;
  return {
    update(e) {
      if (e.kind === "start") stream.write(`[${done}/${total}] ${e.id}: started\n`);
      else if (e.kind === "done" || e.kind === "failed") {
        done++;
        stream.write(`[${done}/${total}] ${e.id}: ${e.kind === "done" ? "done" : "FAILED"}${e.text ? " " + e.text : ""}\n`);
      }
    },
    stop() {},
  };
}
