/**
 * The rollwise command line: `npm run --silent rollwise -- <command> …`.
 * Each command lives in its own module and returns the process exit code.
 */
type Command = (argv: string[]) => Promise<number>;

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

async function main(): Promise<number> {
  const [name, ...rest] = process.argv.slice(2);
  const cmd = name ? commands[name] : undefined;
  if (!cmd) {
    process.stderr.write(`rollwise: ${name ? `unknown command "${name}"` : 'no command given'}\nCommands:\n`);
    for (const c of Object.values(commands)) process.stderr.write(`  ${c.help}\n`);
    return 2;
  }
  return (await cmd.load())(rest);
}

main().then((code) => {
  process.exitCode = code;
});
