import type { CommandIO } from "./commands.ts";
export async function initCommand(argv: string[], io: CommandIO): Promise<number> {
  io.err("not yet");
  return 2;
}
