import { readFileSync } from "node:fs";
import os from "node:os";

/** What the numbers were measured on (JSON-ready). */
export interface MachineDescription {
  readonly cpuModel: string;
  /** Logical cores the OS reports. */
  readonly cores: number;
  readonly memoryGiB: number;
  readonly platform: string;
  readonly node: string;
  readonly v8: string;
  /** 1-, 5- and 15-minute load averages when the run started. */
  readonly loadAtStart: readonly number[];
}

/** Reads the CPU model (from /proc/cpuinfo when os.cpus() gives a bare name), cores, memory, Node and V8. */
export function describeMachine(): MachineDescription {
  const cpus = os.cpus();
  let cpuModel = cpus[0]?.model ?? "unknown";
  // Virtual machines often report only a family name; cpuinfo's family/model numbers narrow it down.
  try {
    const info = readFileSync("/proc/cpuinfo", "utf8");
    const field = (name: string) => new RegExp(`^${name}\\s*:\\s*(.*)$`, "m").exec(info)?.[1]?.trim();
    const family = field("cpu family");
    const model = field("model");
    if (family && model) cpuModel += ` (family ${family}, model ${model})`;
  } catch {
    // Not Linux: the os.cpus() name is all there is.
  }
  return {
    cpuModel,
    cores: cpus.length,
    memoryGiB: Math.round((os.totalmem() / 2 ** 30) * 10) / 10,
    platform: `${os.type()} ${os.release()} ${os.arch()}`,
    node: process.version,
    v8: process.versions.v8,
    loadAtStart: os.loadavg().map((x) => Math.round(x * 100) / 100),
  };
}
