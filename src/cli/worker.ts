/**
 * A compute worker (a thread of the pool in compute.ts): prepares and computes one spec and
 * returns its record; progress goes back through the given port. Records are written by the
 * main thread only, which holds the archive lock.
 */
import type { MessagePort } from "node:worker_threads";
import { calculate, prepareSpec } from "./calculate.ts";

export interface Task {
  root: string;
  path: string;
  port?: MessagePort;
}

export default function compute(task: Task) {
  const { prepared, errors } = prepareSpec(task.root, task.path);
  if (!prepared) return { record: null, errors };
  const { record } = calculate(task.root, prepared, (e) => {
    if (!task.port) return;
    if (e.type === "iteration")
      task.port.postMessage(`SCF ${e.data.iteration} E=${e.data.energy.toFixed(8)} ΔE=${Number.isFinite(e.data.deltaEnergy) ? e.data.deltaEnergy.toExponential(1) : "–"}`);
    else if (e.type === "stage" && e.state === "start") task.port.postMessage(e.stage);
  });
  task.port?.close();
  return { record, errors: [] };
}
