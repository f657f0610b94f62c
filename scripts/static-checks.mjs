#!/usr/bin/env node
/**
 * The static checks of `npm test`, run side by side (each is short and mostly
 * single-threaded, so on 2 cores three at once take about as long as the
 * longest): the type check (tsc), layout and lint (biome ci, warnings fail
 * too) and the layer rule (dependency-cruiser, .dependency-cruiser.cjs). Each
 * one's output is printed whole, in this order, once all have finished; the
 * exit code is 1 if any failed.
 */
import { spawn } from "node:child_process";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const bin = (name) => path.join(root, "node_modules", ".bin", process.platform === "win32" ? `${name}.cmd` : name);
const CHECKS = [
  ["types (tsc)", bin("tsc"), ["--noEmit", "-p", "."]],
  ["layout and lint (biome)", bin("biome"), ["ci", "--error-on-warnings", "--reporter=summary", "--colors=off"]],
  ["layers (dependency-cruiser)", bin("depcruise"), ["src", "--config", ".dependency-cruiser.cjs", "--output-type", "err"]],
];

function run([name, cmd, args]) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: root, shell: process.platform === "win32" });
    let out = "";
    child.stdout.on("data", (d) => (out += d));
    child.stderr.on("data", (d) => (out += d));
    child.on("error", (e) => resolve({ name, code: 1, out: `${out}${e.message}\n` }));
    child.on("close", (code) => resolve({ name, code: code ?? 1, out }));
  });
}

const results = await Promise.all(CHECKS.map(run));
for (const r of results) {
  process.stdout.write(`${r.code === 0 ? "ok  " : "FAIL"} ${r.name}\n`);
  if (r.code !== 0 && r.out.trim()) process.stdout.write(`${r.out.trimEnd()}\n`);
}
process.exit(results.some((r) => r.code !== 0) ? 1 : 0);
