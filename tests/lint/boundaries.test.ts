// Proves that eslint.config.js's import-boundary and cycle rules actually fire: both plugins
// pass silently when their resolvers are misconfigured, so every rule has a fixture it must
// reject and a neighbour it must accept.
import path from "node:path";
import { ESLint, type Linter } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "../..");
const fixtures = path.join(import.meta.dirname, "fixtures");

const BOUNDARIES = "boundaries/dependencies";
const CYCLE = "import-x/no-cycle";

// The real config, with the project root moved into the fixture tree: the fixture
// tests/lint/fixtures/shared/x.ts is classified as shared/x.ts. `ignore: false` because the
// main config ignores the fixtures (they are broken on purpose).
const fixtureLinter = new ESLint({
  cwd: root,
  ignore: false,
  overrideConfig: { settings: { "boundaries/root-path": fixtures } },
});

// The real config, untouched, for virtual files placed in the real tree.
const treeLinter = new ESLint({ cwd: root });

const results = new Map<string, Linter.LintMessage[]>();

beforeAll(async () => {
  for (const result of await fixtureLinter.lintFiles([fixtures])) {
    results.set(
      path.relative(fixtures, result.filePath).split(path.sep).join("/"),
      result.messages,
    );
  }
}, 60_000);

function messagesOf(fixture: string): Linter.LintMessage[] {
  const messages = results.get(fixture);
  if (!messages)
    throw new Error(
      `fixture ${fixture} was not linted (linted: ${[...results.keys()].join(", ")})`,
    );
  return messages;
}

const describeMessages = (messages: Linter.LintMessage[]) =>
  messages.map(
    (m) => `${m.line}:${m.column} ${m.ruleId ?? "fatal"} ${m.message}`,
  );

describe("fixture tree", () => {
  it("lints every fixture without parse errors", () => {
    expect(results.size).toBeGreaterThanOrEqual(20);
    for (const [file, messages] of results) {
      expect(
        messages.filter((m) => m.fatal || m.ruleId === null),
        file,
      ).toEqual([]);
    }
  });

  const forbidden: Array<[fixture: string, line: number, because: string]> = [
    ["shared/forbidden-imports-server.ts", 1, "shared → server"],
    ["shared/forbidden-imports-src.ts", 1, "shared → src"],
    ["shared/forbidden-imports-tests.ts", 1, "shared → tests"],
    ["server/forbidden-imports-src.ts", 1, "server → src"],
    [
      "server/forbidden-imports-tests-setup.ts",
      1,
      "server → tests other than tests/factories",
    ],
    ["src/forbidden-imports-server.ts", 1, "src → server"],
    ["src/forbidden-imports-tests.ts", 1, "src → tests"],
    [
      "src/features/beta/forbidden-imports-other-feature.ts",
      1,
      "feature beta → feature alpha",
    ],
  ];
  it.each(forbidden)("reports %s (%s)", (fixture, line, _because) => {
    const messages = messagesOf(fixture);
    expect(describeMessages(messages)).toEqual([
      expect.stringMatching(new RegExp(`^${line}:\\d+ ${BOUNDARIES} `)),
    ]);
    expect(messages[0].severity).toBe(2);
  });

  it("explains a shared/ violation in words", () => {
    expect(
      messagesOf("shared/forbidden-imports-server.ts")[0].message,
    ).toContain("shared/");
  });

  const allowed = [
    "server/allowed-imports-shared-and-factories.ts", // server → shared, server → tests/factories
    "server/allowed-unit.test.ts", // a unit test beside server code → tests/setup
    "src/allowed-imports-shared.ts", // src → shared, src → src/lib
    "src/app/allowed-composes-features.ts", // src/app → two features
    "src/features/alpha/components/allowed-same-feature.ts", // inside one feature, and → src/lib
    "src/features/beta/allowed-uses-lib-and-shared.ts", // feature → shared, feature → src/lib
    "tests/factories/builders.ts", // tests → server, shared
    "tests/setup/test-app.ts", // tests → server, src
  ];
  it.each(allowed)("accepts %s", (fixture) => {
    expect(describeMessages(messagesOf(fixture))).toEqual([]);
  });

  it("reports the .ts ↔ .tsx import cycle from both sides", () => {
    for (const fixture of [
      "server/cycle/cycle-a.ts",
      "server/cycle/CycleB.tsx",
    ]) {
      expect(describeMessages(messagesOf(fixture)), fixture).toEqual([
        expect.stringMatching(new RegExp(`^1:\\d+ ${CYCLE} `)),
      ]);
    }
  });
});

// The same rules on the real tree, through virtual files: guards against the element
// patterns drifting away from the real folder names (root-path is not overridden here).
describe("real tree", () => {
  const lint = async (filePath: string, code: string) => {
    const [result] = await treeLinter.lintText(code, {
      filePath: path.join(root, filePath),
    });
    return result.messages.filter((m) => m.ruleId === BOUNDARIES);
  };

  it("reports shared/ importing server/app", async () => {
    const messages = await lint(
      "shared/__lint_fixture__.ts",
      'export * from "../server/app";\n',
    );
    expect(describeMessages(messages)).toHaveLength(1);
  });

  it("reports src/ importing server/app", async () => {
    const messages = await lint(
      "src/lib/__lint_fixture__.ts",
      'export * from "../../server/app";\n',
    );
    expect(describeMessages(messages)).toHaveLength(1);
  });

  it("reports server/ importing tests/setup", async () => {
    const messages = await lint(
      "server/db/__lint_fixture__.ts",
      'export * from "../../tests/setup/test-app";\n',
    );
    expect(describeMessages(messages)).toHaveLength(1);
  });

  it("accepts server/ importing shared/ and tests/factories", async () => {
    const code =
      'export * from "../../shared/schemas";\nexport * from "../../tests/factories/builders";\n';
    expect(
      describeMessages(await lint("server/db/__lint_fixture__.ts", code)),
    ).toEqual([]);
  });
});
