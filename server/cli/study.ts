/**
 * `rollwise study --spec FILE`: a tolerance study or design sweep run in
 * this process, chunk by chunk, printed as JSON (docs/studies.md). The spec
 * file is a study spec with its documents embedded, or naming them by path
 * (`"corner": "front.json"`, relative to the spec file). Bad input → exit 2
 * naming the field.
 */
import { dirname, resolve } from 'node:path';
import { InputError } from '../../shared/errors.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { planStudy, runStudyChunk, combineStudyChunks, studySpecSchema } from '../../shared/study/index.js';
import { parseOrThrow } from '../../shared/errors.js';
import { parseArgs, readJsonFile, requireArg, runCommand, type CliIo } from './args.js';

const DOCUMENT_FIELDS = ['corner', 'otherCorner', 'vehicle'] as const;

/** `study --spec FILE [--progress]` */
export function studyCommand(argv: string[], io: CliIo): Promise<number> {
  return runCommand(io, () => {
    const args = parseArgs(argv);
    for (const k of args.keys()) {
      if (k !== 'spec' && k !== 'progress') throw new InputError(`--${k}: unknown option (expected --spec, --progress)`, [{ path: `--${k}`, message: 'unknown option' }]);
    }
    const path = requireArg(args, 'spec');
    const raw = readJsonFile(path, '--spec');
    if (!raw || typeof raw !== 'object' || Array.isArray(raw)) throw new InputError(`--spec ${path}: must hold a JSON object (a study spec)`, [{ path: '--spec', message: 'not a JSON object' }]);
    const doc = { ...(raw as Record<string, unknown>) };
    for (const f of DOCUMENT_FIELDS) {
      const v = doc[f];
      if (typeof v === 'string') doc[f] = readJsonFile(resolve(dirname(path), v), `--spec ${path}: ${f}`);
    }
    let spec;
    try {
      spec = parseOrThrow(studySpecSchema, doc, 'study spec');
      planStudy(spec);
    } catch (e) {
      if (e instanceof InputError) {
        const issues = e.issues.map((i) => ({ path: `--spec ${path}: ${i.path}`, message: i.message }));
        throw new InputError(`--spec ${path}: ${e.message.replace(/^Invalid study spec: /, '')}`, issues);
      }
      throw e;
    }
    const plan = planStudy(spec);
    const chunks = [];
    const progress = args.has('progress');
    for (let i = 0; i < plan.chunkCount; i++) {
      chunks.push(runStudyChunk(spec, i));
      if (progress) io.stderr(`chunk ${i + 1} of ${plan.chunkCount}\n`);
    }
    return { engineVersion: ENGINE_VERSION, plan, result: combineStudyChunks(spec, chunks) };
  });
}
