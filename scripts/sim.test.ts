/**
 * `npm run sim -- FILE.json` (issue 3, item 5), spawned as a real process.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const root = process.cwd();
const scenarios = join(root, "seeds", "scenarios");
const KEYS = ["breath", "pipCmH2O", "pplatCmH2O", "vtiMl", "vteMl", "peakFlowLpm", "tiS", "mpawCmH2O", "inspiratoryPressureCmH2O", "alarms"];

function sim(...args: string[]) {
  const run = spawnSync(join(root, "node_modules", ".bin", "tsx"), [join(root, "scripts", "sim.ts"), ...args], { encoding: "utf8", cwd: root });
  const lines = run.stdout.split("\n").filter(Boolean);
  return { status: run.status, stderr: run.stderr, rows: lines.map((l) => JSON.parse(l) as Record<string, unknown>), lines };
}

function tempFile(content: string): string {
  const file = join(mkdtempSync(join(tmpdir(), "sim-")), "scenario.json");
  writeFileSync(file, content);
  return file;
}

describe("npm run sim", () => {
  it("prints one JSON object per breath with exactly the keys of issue 3, in order", () => {
    const run = sim(join(scenarios, "vc-compliance-fall.json"));
    expect(run.status).toBe(0);
    expect(run.rows).toHaveLength(14);
    for (const row of run.rows) expect(Object.keys(row)).toEqual(KEYS);
    expect(run.rows.map((r) => r.breath)).toEqual(Array.from({ length: 14 }, (_, i) => i + 1));
    // Compliance 50 → 25 at breath 6: Pplat 15 → 25 (PEEP 5 + 500/25).
    expect(run.rows[4].pplatCmH2O).toBeCloseTo(15, 1);
    expect(run.rows[5].pplatCmH2O).toBeCloseTo(25, 1);
    expect(run.rows[5].inspiratoryPressureCmH2O).toBeNull();
  });

  it("the flow-starvation example raises low-pressure while delivering the set 500 mL", () => {
    const run = sim(join(scenarios, "vc-flow-starvation.json"));
    expect(run.rows[2].alarms).toEqual([]);
    expect(run.rows[9].alarms).toEqual(["low-pressure"]);
    expect(run.rows[9].vtiMl).toBe(500);
    expect(run.rows[9].pipCmH2O as number).toBeLessThan(15);
  });

  it("the adaptive example reports the pressure aimed for, and null for the test breath", () => {
    const run = sim(join(scenarios, "adaptive-compliance-fall.json"));
    expect(run.rows[0].inspiratoryPressureCmH2O).toBeNull();
    expect(run.rows[0].pplatCmH2O).toBe(15);
    expect(run.rows[1].inspiratoryPressureCmH2O).toBe(10);
  });

  it.each(readdirSync(scenarios).filter((f) => f.endsWith(".json")))("runs the shipped example %s", (file) => {
    const run = sim(join(scenarios, file));
    expect(run.stderr).toBe("");
    expect(run.status).toBe(0);
    expect(run.rows.length).toBeGreaterThan(0);
  });

  it("gives the same bytes twice for the same file (seeded)", () => {
    const file = join(scenarios, "adaptive-erratic-effort.json");
    expect(sim(file).lines.join("\n")).toBe(sim(file).lines.join("\n"));
  });

  it("refuses a bad file with exit status 2 and a message naming each field and its range", () => {
    const file = tempFile(
      JSON.stringify({
        mode: "volume-control",
        settings: { tidalVolumeMl: 5000, peakFlowLpm: 60, rateBpm: 0, peepCmH2O: 5 },
        patient: { complianceMlPerCmH2O: -10, resistanceCmH2OPerLps: 10 },
      }),
    );
    const run = sim(file);
    expect(run.status).toBe(2);
    expect(run.lines).toEqual([]);
    expect(run.stderr).toContain("settings.tidalVolumeMl: must be a number between 20 and 2000 mL (got 5000)");
    expect(run.stderr).toContain("settings.rateBpm: must be a number between 4 and 80 breaths/min (got 0)");
    expect(run.stderr).toContain("patient.complianceMlPerCmH2O: must be a number between 1 and 200 mL/cmH2O (got -10)");
  });

  it("refuses a file that is not JSON, a missing file and a missing argument with exit status 2", () => {
    const notJson = sim(tempFile("{ mode: volume-control"));
    expect(notJson.status).toBe(2);
    expect(notJson.stderr).toMatch(/not valid JSON/);
    const missing = sim(join(tmpdir(), "no-such-scenario.json"));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/cannot read the file \(ENOENT\)/);
    const none = sim();
    expect(none.status).toBe(2);
    expect(none.stderr).toMatch(/usage: npm run sim -- FILE\.json/);
  });
});
