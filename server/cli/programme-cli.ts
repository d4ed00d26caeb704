// `npm run programme -- FILE.json`: print the result of scheduleProgramme for a file in the
// JSON contract (issue 3). Only the result goes to stdout; invalid input gives one
// plain-English line per problem on stderr and a non-zero exit.
import { readFileSync } from "node:fs";
import {
  parseProgrammeInput,
  ProgrammeInputError,
  scheduleProgramme,
} from "../../shared/programme/index";

function fail(lines: string[], code = 1): never {
  for (const l of lines) process.stderr.write(l + "\n");
  process.exit(code);
}

const file = process.argv[2];
if (!file || process.argv.length > 3)
  fail(["Usage: npm run programme -- FILE.json"], 2);

let text: string;
try {
  text = readFileSync(file, "utf8");
} catch (err) {
  fail([`Cannot read ${file}: ${(err as Error).message}`]);
}

let raw: unknown;
try {
  raw = JSON.parse(text);
} catch (err) {
  fail([`${file} is not valid JSON: ${(err as Error).message}`]);
}

const parsed = parseProgrammeInput(raw);
if (!parsed.ok) fail(parsed.problems);

try {
  process.stdout.write(
    JSON.stringify(scheduleProgramme(parsed.input), null, 2) + "\n",
  );
} catch (err) {
  if (err instanceof ProgrammeInputError) fail(err.problems);
  throw err;
}
