// The one place the app loads odex (2.0.x). odex ships its TypeScript source
// beside its JS entry, and a strict build that follows `import 'odex'` into
// that source fails to type-check it (stack-notes.md), so TypeScript sees the
// declarations in odex-solver.d.ts instead and only this file imports odex.
export { Solver } from 'odex';
