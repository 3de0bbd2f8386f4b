/**
 * The rollwise command line: `npm run --silent rollwise -- <command> …`.
 * Each command lives in its own module and returns the process exit code.
 * `runRollwise(argv, io)` is the whole program as a function: the entry point
 * below hands it the process's arguments and streams; tests call it in-process
 * with their own writers (test/support/cli.ts).
 */
import { pathToFileURL } from 'node:url';
import { processIo, type CliIo } from './args.js';

export type { CliIo };

type Command = (argv: string[], io: CliIo) => Promise<number>;

const commands: Record<string, { help: string; load: () => Promise<Command> }> = {
  sweep: { help: 'sweep --corner FILE --travel=FROM:TO:STEP [--rack=R1,R2,…]', load: async () => (await import('./kinematics.js')).sweepCommand },
  roll: { help: 'roll --corner FILE --roll=FROM:TO:STEP [--rack=…] [--wheelbase=MM]', load: async () => (await import('./kinematics.js')).rollCommand },
  compliance: { help: 'compliance --corner FILE [--travel=MM] [--rack=MM]', load: async () => (await import('./compliance.js')).complianceCommand },
  balance: { help: 'balance --vehicle FILE [--front-corner FILE --rear-corner FILE] [--speed=KPH]', load: async () => (await import('./balance.js')).balanceCommand },
  ride: {
    help: 'ride --vehicle FILE --axle front|rear --road-class A..H --speed=KPH [--corner FILE] [--radius=M] [--bump=HEIGHT_MM:LENGTH_MM] [--landing=DROP_MM]',
    load: async () => (await import('./ride.js')).rideCommand,
  },
  solve: { help: 'solve --intent FILE', load: async () => (await import('./intent.js')).solveCommand },
  study: { help: 'study --spec FILE [--progress]', load: async () => (await import('./study.js')).studyCommand },
};

/** Runs one command line (`argv` without node and the script: `['sweep', '--corner', …]`); resolves with the exit code. */
export async function runRollwise(argv: readonly string[], io: CliIo = processIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === 'help' || name === '--help' || name === '-h') {
    io.stdout('Usage: npm run --silent rollwise -- COMMAND [FLAGS]  (JSON on stdout; messages on stderr; exit 2 on bad input)\nCommands:\n');
    for (const c of Object.values(commands)) io.stdout(`  ${c.help}\n`);
    return 0;
  }
  const cmd = name ? commands[name] : undefined;
  if (!cmd) {
    io.stderr(`rollwise: ${name ? `unknown command "${name}"` : 'no command given'}\nCommands:\n`);
    for (const c of Object.values(commands)) io.stderr(`  ${c.help}\n`);
    return 2;
  }
  return (await cmd.load())(rest, io);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  void runRollwise(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
