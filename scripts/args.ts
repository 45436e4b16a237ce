/** Command-line numbers of the bench scripts: `--name value`, else the fallback. */
export function numberArg(args: readonly string[], name: string, fallback: number): number {
  const i = args.indexOf(name);
  return i >= 0 ? Number(args[i + 1]) : fallback;
}
