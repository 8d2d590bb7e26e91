// Every problem in a board file is collected with the file, the path to the field and what is wrong,
// so a user fixes them all in one round instead of one per run.

export interface Problem {
  file: string;
  /** Path to the field, e.g. "components[12].value" or "line 3, column 5"; "" for the file itself. */
  path: string;
  message: string;
}

/** One line: "file: path: message" (or "file: message" when the problem is the file as a whole). */
export function formatProblem(problem: Problem): string {
  const message = oneLine(problem.message);
  return problem.path ? `${problem.file}: ${problem.path}: ${message}` : `${problem.file}: ${message}`;
}

/** Thrown by loadBoard and parseBoardText; `.problems` has all problems, `.message` the first as one line. */
export class BoardError extends Error {
  readonly problems: Problem[];

  constructor(problems: Problem[]) {
    super(problems.length > 0 ? formatProblem(problems[0]) : 'board file has problems');
    this.name = 'BoardError';
    this.problems = problems;
  }
}

/** Collects problems for one file while it is read. */
export class ProblemLog {
  readonly problems: Problem[] = [];

  constructor(readonly file: string) {}

  add(path: string, message: string): void {
    this.problems.push({ file: this.file, path, message: oneLine(message) });
  }

  get count(): number {
    return this.problems.length;
  }

  throwIfAny(): void {
    if (this.problems.length > 0) throw new BoardError(this.problems);
  }
}

/** Joins path segments the way a reader of the file would write them: lattice.bonds[2].value. */
export function pathText(segments: readonly PropertyKey[]): string {
  let text = '';
  for (const segment of segments) {
    if (typeof segment === 'number') text += `[${segment}]`;
    else if (/^[A-Za-z_][A-Za-z0-9_]*$/.test(String(segment))) text += text ? `.${String(segment)}` : String(segment);
    else text += `[${JSON.stringify(String(segment))}]`;
  }
  return text;
}

export function joinPath(base: string, ...segments: PropertyKey[]): string {
  const rest = pathText(segments);
  if (!base) return rest;
  return rest.startsWith('[') || rest === '' ? base + rest : `${base}.${rest}`;
}

function oneLine(text: string): string {
  return text.replace(/\s*\r?\n\s*/g, ' ').trim();
}
