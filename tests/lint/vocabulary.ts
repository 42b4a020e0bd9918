import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * The glossary's vocabulary check (DEVELOPERS.md, Glossary): old spellings of the project's
 * names, found in TypeScript as identifiers (comments and string text do not count) or, for
 * stored names, anywhere in code and strings. A line carrying the comment `vocab-rename: keep`
 * names an old spelling on purpose and is exempt; so is a file whose first line carries it.
 */

/** The comment that exempts a line (or, on line 1, a file). */
export const KEEP_MARK = 'vocab-rename: keep';

/** Folders whose git-tracked .ts/.tsx files are checked. */
export const CHECKED_FOLDERS = ['server', 'shared', 'src', 'simulator', 'bench'] as const;

/** Migrations that already ran stay as they are (they name the old table and columns). */
const RAN_BEFORE_STORAGE_RENAME = /^server\/db\/migrations\/(\d{4})-/;
const STORAGE_RENAME_MIGRATION = 1780;

/** One old spelling found. */
export interface Violation {
  file: string;
  line: number;
  rule: string;
  found: string;
  say: string;
}

/** What a rule reads of a line: code only (comments and string text blanked), or code and strings. */
type View = 'code' | 'code-and-strings';

interface Rule {
  id: string;
  view: View;
  pattern: RegExp;
  /** What to write instead (the glossary's word). */
  say: string;
  /** A match that is a legitimate word here (another meaning of the same letters). */
  allowed?: (found: string, file: string) => boolean;
}

/**
 * "sample" words that mean something else than a reading, each with its reason. A reading is
 * never a "sample" in a name; a meter's sample period, resampling and a benchmark sampling its
 * own memory or load are other things.
 */
const ALLOWED_SAMPLE_WORDS: { word: RegExp; files?: RegExp; why: string }[] = [
  { word: /^samplePeriod\w*$/, why: "a meter's sample period (legacy scenario key)" },
  { word: /^[Rr]esampl\w*$/, why: 'resampling a signal' },
  { word: /^sample$/, files: /^(simulator\/|bench\/simulator\.bench\.ts$)/, why: 'MeterDevice.sample: the simulated meter sampling the simulated signal' },
  { word: /^sample$/, files: /^bench\/live\.bench\.ts$/, why: "the benchmark sampling the process's memory (statistics)" },
  { word: /^sampler$/, files: /^bench\/gateways\.bench\.ts$/, why: "the benchmark's timer sampling load figures (statistics)" },
];

/** The rules, chosen from the glossary's renames. */
export const RULES: readonly Rule[] = [
  {
    id: 'sample-for-reading',
    view: 'code',
    pattern: /\b\w*(?:[Ss]ample|SAMPLE)\w*\b/g,
    say: 'a reading is never a "sample" in a name: reading, readings, readingsOf, ...',
    allowed: (found, file) => ALLOWED_SAMPLE_WORDS.some((a) => a.word.test(found) && (!a.files || a.files.test(file))),
  },
  { id: 'chunk-table', view: 'code-and-strings', pattern: /\brun_sample_chunks\b/g, say: 'the chunk table is run_reading_chunks (migration 1780)' },
  { id: 'chunk-run-time', view: 'code-and-strings', pattern: /\b(?:first|last)Elapsed\b/g, say: 'run time ends in Seconds: firstElapsedSeconds, lastElapsedSeconds' },
  { id: 'archive-run-time', view: 'code-and-strings', pattern: /\.elapsed\b|(['"])elapsed\1/g, say: "a reading's run time column is elapsedSeconds" },
  { id: 'temperature-unit', view: 'code', pattern: /\b(?:\w*[a-z])?[Tt]empC\b/g, say: 'temperatures end in Celsius: tempCelsius, overTempCelsius' },
  { id: 'seconds-unit', view: 'code', pattern: /\b(?:staleAfterS|durationS)\b/g, say: 'durations in seconds end in Seconds: staleAfterSeconds, durationSeconds' },
  {
    id: 'unit-constant',
    view: 'code',
    pattern: /\b(?:const|let|var)\s+MS_PER_S\b/g,
    say: 'unit constants come from shared/units (import MS_PER_S)',
    allowed: (_found, file) => file.startsWith('shared/units/'),
  },
  { id: 'clock-now', view: 'code', pattern: /\b\w*[Cc]lock\s*\.\s*now\s*\(/g, say: 'a Clock reads Clock.nowMs() (milliseconds since the epoch)' },
];

/** The rule for a block: ImportSummary totals are discharge figures (`dischargeAh`), never `chargeAh`. */
const IMPORT_SUMMARY_START = /\b(?:interface\s+ImportSummary\b|ImportSummary(?:Schema)?\s*=\s*z\.object\()/;
const IMPORT_SUMMARY_RULE = { id: 'import-summary-charge', pattern: /\bchargeAh\b/g, say: 'ImportSummary gives the discharge: dischargeAh (the run summary holds chargeAh)' };

/** A line as the rules read it: code with comments removed, with and without string text. */
interface LineViews {
  code: string;
  'code-and-strings': string;
}

/** Characters after which a `/` starts a regular expression rather than a division. */
const REGEX_MAY_FOLLOW = /(?:^|[(,=:[!&|?{};+\-*%<>~^]|\breturn|\btypeof|\bcase)\s*$/;

/**
 * Splits TypeScript into lines and blanks what is not code: comments always, and the text of
 * strings, template literals (outside `${…}`) and regular expressions in the `code` view. A
 * small scanner, not a parser: it errs towards reading too little, never flags string text.
 */
export function lineViews(source: string): LineViews[] {
  const code: string[] = [];
  const withStrings: string[] = [];
  type Mode = 'code' | 'line-comment' | 'block-comment' | 'single' | 'double' | 'template' | 'regex';
  let mode: Mode = 'code';
  let inClass = false;
  /** Brace depth inside each open `${`, innermost last. */
  const templateDepths: number[] = [];
  let a = '';
  let b = '';
  const put = (c: string, keepInCode: boolean, keepInStrings: boolean) => {
    a += keepInCode ? c : ' ';
    b += keepInStrings ? c : ' ';
  };
  for (let i = 0; i < source.length; i++) {
    const c = source[i]!;
    const next = source[i + 1];
    if (c === '\n') {
      code.push(a);
      withStrings.push(b);
      a = '';
      b = '';
      if (mode === 'line-comment' || mode === 'single' || mode === 'double' || mode === 'regex') mode = 'code';
      continue;
    }
    switch (mode) {
      case 'code':
        if (c === '/' && next === '/') {
          mode = 'line-comment';
          put(c, false, false);
        } else if (c === '/' && next === '*') {
          mode = 'block-comment';
          put(c, false, false);
        } else if (c === '/' && REGEX_MAY_FOLLOW.test(a)) {
          mode = 'regex';
          inClass = false;
          put(c, true, true);
        } else if (c === "'" || c === '"' || c === '`') {
          mode = c === "'" ? 'single' : c === '"' ? 'double' : 'template';
          put(c, true, true);
        } else {
          if (templateDepths.length) {
            if (c === '{') templateDepths[templateDepths.length - 1]!++;
            if (c === '}') {
              if (templateDepths[templateDepths.length - 1] === 0) {
                templateDepths.pop();
                mode = 'template';
              } else templateDepths[templateDepths.length - 1]!--;
            }
          }
          put(c, true, true);
        }
        break;
      case 'line-comment':
        put(c, false, false);
        break;
      case 'block-comment':
        put(c, false, false);
        if (c === '*' && next === '/') {
          put('/', false, false);
          i++;
          mode = 'code';
        }
        break;
      case 'single':
      case 'double':
      case 'template':
      case 'regex': {
        const closes = mode === 'single' ? "'" : mode === 'double' ? '"' : mode === 'template' ? '`' : '/';
        if (c === '\\') {
          put(c, false, true);
          if (next !== undefined && next !== '\n') {
            put(next, false, true);
            i++;
          }
        } else if (mode === 'template' && c === '$' && next === '{') {
          put('${', true, true);
          i++;
          templateDepths.push(0);
          mode = 'code';
        } else if (mode === 'regex' && (c === '[' || c === ']')) {
          inClass = c === '[';
          put(c, false, true);
        } else if (c === closes && !(mode === 'regex' && inClass)) {
          put(c, true, true);
          mode = 'code';
        } else put(c, false, true);
        break;
      }
    }
  }
  code.push(a);
  withStrings.push(b);
  return code.map((line, i) => ({ code: line, 'code-and-strings': withStrings[i]! }));
}

/** Old spellings in one file's text (`file` is its path from the repository root, with `/`). */
export function checkVocabulary(file: string, source: string): Violation[] {
  const lines = source.split('\n');
  if (lines[0]?.includes(KEEP_MARK)) return [];
  const views = lineViews(source);
  const out: Violation[] = [];
  let inImportSummary = false;
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!;
    const view = views[i]!;
    const kept = raw.includes(KEEP_MARK);
    if (!kept) {
      for (const rule of RULES) {
        for (const m of view[rule.view].matchAll(rule.pattern)) {
          if (rule.allowed?.(m[0], file)) continue;
          out.push({ file, line: i + 1, rule: rule.id, found: m[0], say: rule.say });
        }
      }
    }
    if (IMPORT_SUMMARY_START.test(view.code)) inImportSummary = true;
    if (inImportSummary && !kept) {
      for (const m of view.code.matchAll(IMPORT_SUMMARY_RULE.pattern)) out.push({ file, line: i + 1, rule: IMPORT_SUMMARY_RULE.id, found: m[0], say: IMPORT_SUMMARY_RULE.say });
    }
    // The block ends where its braces close at the start of a line (`});` or `}`).
    if (inImportSummary && /^\}/.test(view.code)) inImportSummary = false;
  }
  return out;
}

/** Whether a tracked file is checked: TypeScript in a checked folder, not a migration that already ran. */
export function isChecked(file: string): boolean {
  if (!/\.tsx?$/.test(file) || file.endsWith('.d.ts')) return false;
  if (!CHECKED_FOLDERS.some((folder) => file.startsWith(`${folder}/`))) return false;
  const migration = RAN_BEFORE_STORAGE_RENAME.exec(file);
  return !migration || Number(migration[1]) >= STORAGE_RENAME_MIGRATION;
}

/** Old spellings in every checked git-tracked file of the repository at `root`. */
export function checkRepository(root: string): Violation[] {
  const tracked = execFileSync('git', ['ls-files', '-z', '--', ...CHECKED_FOLDERS], { cwd: root, encoding: 'utf8' }).split('\0').filter(Boolean);
  return tracked.filter(isChecked).flatMap((file) => checkVocabulary(file, readFileSync(join(root, file), 'utf8')));
}
