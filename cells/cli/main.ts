/** Entry of the `couplet` command: returns the exit code. */
export async function main(argv: string[]): Promise<number> {
  process.stderr.write(`couplet: not implemented yet (${argv.join(" ")})\n`);
  return 2;
}
