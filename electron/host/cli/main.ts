/**
 * The `daybreak` command line. Sub-commands live one per file beside this one.
 * Exit codes for every sub-command: 0 done, 1 done but some input was bad and was reported,
 * 2 unusable arguments; `scan` also 3, failed (its reason on stderr).
 */
const USAGE = `usage: daybreak <command> [options]

commands:
  info [--json] PATH...   what the miniSEED files at PATH (files or folders) hold
  demo [--out DIR] [--seed N] [--workers N]
                          (re)generate the invented demo scenario (default samples/generated)
`;

type Command = (args: string[]) => Promise<number>;

const commands: Record<string, () => Promise<Command>> = {
  info: async () => (await import('./info')).info,
  demo: async () => (await import('./demo')).demo,
  scan: async () => (await import('./scan')).scan,
};

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h') {
    process.stdout.write(USAGE);
    return name ? 0 : 2;
  }
  const load = commands[name];
  if (!load) {
    process.stderr.write(`daybreak: unknown command "${name}"\n${USAGE}`);
    return 2;
  }
  return (await load())(rest);
}
