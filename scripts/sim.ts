/**
 * `npm run sim -- FILE.json` — runs a bench scenario file and prints one JSON object per line
 * per breath (issue 3, item 5):
 *   {"breath","pipCmH2O","pplatCmH2O","vtiMl","vteMl","peakFlowLpm","tiS","mpawCmH2O",
 *    "inspiratoryPressureCmH2O","alarms"}
 * A file that cannot be read, is not JSON, or fails validation gets a message naming the
 * field (and its allowed range) on stderr and exit status 2. Example files: seeds/scenarios/.
 */
import { readFileSync } from "node:fs";
import { simulate, toBreathLine, validateScenario } from "../app/domain/bench/index";

const USAGE = "usage: npm run sim -- FILE.json   (examples in seeds/scenarios/)";

function fail(message: string): never {
  process.stderr.write(`${message}\n`);
  process.exit(2);
}

function main(argv: string[]): void {
  const args = argv.filter((a) => a !== "--");
  if (args.length !== 1 || args[0] === "--help" || args[0] === "-h") fail(USAGE);
  const file = args[0];
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (error) {
    fail(`${file}: cannot read the file (${(error as NodeJS.ErrnoException).code ?? String(error)})`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    fail(`${file}: not valid JSON (${(error as Error).message})`);
  }
  const checked = validateScenario(json);
  if (!checked.ok) {
    fail(`${file}: invalid scenario\n${checked.errors.map((e) => `  ${e.field}: ${e.message}`).join("\n")}`);
  }
  const result = simulate(checked.scenario);
  const lines = result.breaths.map((b) => JSON.stringify(toBreathLine(b)));
  process.stdout.write(lines.length ? `${lines.join("\n")}\n` : "");
  if (result.stoppedEarly === "apnoea") {
    process.stderr.write(`stopped after ${result.breaths.length} breaths: no breath was triggered for 20 s (apnoea)\n`);
  }
}

main(process.argv.slice(2));
