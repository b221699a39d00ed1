/** The bench scripts' one command-line reader: the value after `name` on the command line, if given. */
export function argValue(name: string): string | undefined {
  const k = process.argv.indexOf(name);
  return k >= 0 ? process.argv[k + 1] : undefined;
}
