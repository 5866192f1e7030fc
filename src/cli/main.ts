/** The command line (placeholder until the analyze command lands). */
export async function main(argv: readonly string[]): Promise<number> {
  console.error(`longipane: not implemented yet (${argv.join(' ')})`);
  return 2;
}
