import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { runCli } from "@/bin/peeksafe-cli";
import { analyzeCampaign, dirichletMultinomialLogBayesFactor, equalFractions, naivePeekingError } from "@/lib/sequential";
import rProp from "../reference/fixtures/fixed-prop-test.json";
import rPlan from "../reference/fixtures/plan-sample-size.json";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";
import srm from "../reference/fixtures/srm-reference.json";
import { closeRelative, TOLERANCE } from "../sequential/tolerance";

const run = (...argv: string[]) => runCli(argv, (file) => readFileSync(file, "utf8"));
const json = (...argv: string[]) => {
  const result = run(...argv);
  expect(result.stderr).toBe("");
  expect(result.exitCode).toBe(0);
  return JSON.parse(result.stdout);
};
const folder = mkdtempSync(path.join(tmpdir(), "peeksafe-cli-"));
const csv = path.join(folder, "counts.csv");
writeFileSync(
  csv,
  ["date,arm,units,conversions", "2026-03-01,holdout,1000,100", "2026-03-01,treatment,1000,130", "2026-03-02,holdout,1000,95", "2026-03-02,treatment,1000,140"].join("\n"),
);

describe("peeksafe ztest", () => {
  it("matches R prop.test(c(130, 100), c(1000, 1000), correct = FALSE) (tests/reference/fixed-prop-test.R)", () => {
    const reference = rProp.cases.find((c) => c.treatment[0] === 130)!;
    const output = json("ztest", "--treatment", "130/1000", "--holdout", "100/1000");
    expect(closeRelative(output.pooled.z ** 2, reference.xSquared, 1e-12)).toBe(true);
    expect(closeRelative(output.pooled.p, reference.pTwoSided, TOLERANCE.pRelative)).toBe(true);
    expect(Object.keys(output)).toEqual(expect.arrayContaining(["pooled", "unpooled", "ci"]));
    expect(output.ci.absolute).toHaveLength(2);
    expect(output.ci.relative).toHaveLength(2);
    const one = json("ztest", "--treatment", "130/1000", "--holdout", "100/1000", "--sides", "1");
    expect(closeRelative(one.pooled.p, reference.pGreater, TOLERANCE.pRelative)).toBe(true);
    expect(one.ci.absolute[1]).toBeNull(); // the open end of a one-sided interval (JSON has no Infinity)
  });
});

describe("peeksafe plan", () => {
  it("matches R power.prop.test(p1 = 0.1, p2 = 0.11, sig.level = 0.05, power = 0.8) (tests/reference/plan-sample-size.R)", () => {
    const reference = rPlan.cases.find((c) => Number(c.baseline) === 0.1 && Number(c.lift) === 0.1 && Number(c.alpha) === 0.05 && Number(c.power) === 0.8 && c.sides === 2)!;
    const output = json("plan", "--baseline", "0.1", "--mde", "0.1", "--daily-units", "2000");
    expect(output.perArm).toEqual({ treatment: Math.ceil(Number(reference.n)), holdout: Math.ceil(Number(reference.n)) });
    expect(output.total).toBe(2 * Math.ceil(Number(reference.n)));
    expect(output.days).toBe(Math.ceil(output.total / 2000));
    expect(output.tau).toBeGreaterThan(0);
    expect(json("plan", "--baseline", "0.1", "--mde", "0.1").days).toBeNull();
    const holdout = json("plan", "--baseline", "0.1", "--mde", "0.1", "--holdout-share", "0.1");
    expect(holdout.perArm.holdout).toBeLessThan(holdout.perArm.treatment);
  });
});

describe("peeksafe analyze", () => {
  it("prints analyzeCampaign's numbers for the CSV (a thin shell)", () => {
    const output = json("analyze", "--counts", csv, "--baseline", "0.1", "--mde", "0.1", "--power", "0.8", "--max-days", "28");
    const expected = analyzeCampaign(
      {
        metric: "conversion", significanceLevel: 0.05, sides: 2, power: 0.8, baselineRate: 0.1, minimumLift: 0.1, maxDays: 28,
        arms: [{ key: "holdout", share: 0.5 }, { key: "treatment", share: 0.5 }],
      },
      [
        { date: "2026-03-01", arm: "holdout", n: 1000, sum: 100, sumSq: 100 },
        { date: "2026-03-01", arm: "treatment", n: 1000, sum: 130, sumSq: 130 },
        { date: "2026-03-02", arm: "holdout", n: 1000, sum: 95, sumSq: 95 },
        { date: "2026-03-02", arm: "treatment", n: 1000, sum: 140, sumSq: 140 },
      ],
    );
    expect(output).toEqual(JSON.parse(JSON.stringify(expected, (_key, value) => (typeof value === "number" && !Number.isFinite(value) ? null : value))));
    expect(output.tau).toBe(expected.tau);
    const day = output.days[1];
    expect(Object.keys(day)).toEqual(expect.arrayContaining(["date", "arms", "lift", "fixed", "sequential", "call", "byArm"]));
    expect(Object.keys(day.fixed)).toEqual(expect.arrayContaining(["z", "p", "ci"]));
    expect(Object.keys(day.sequential)).toEqual(expect.arrayContaining(["p", "cs"]));
    expect(day.arms.treatment.n).toBe(2000);
    expect(output.peekingCost).toBe(naivePeekingError([0.5, 1]));
  });
  it("prints a call that agrees with both printed sequences when the holdout runs below the planned baseline", () => {
    // Planned baseline 4 %, minimum lift +10 % (absolute 0.004); observed holdout 3.2 %, treatment 3.3 %.
    const low = path.join(folder, "low-holdout.csv");
    const lines = ["date,arm,units,conversions"];
    for (let d = 1; d <= 30; d++) {
      const date = `2026-03-${String(d).padStart(2, "0")}`;
      lines.push(`${date},holdout,10000,320`, `${date},treatment,10000,330`);
    }
    writeFileSync(low, lines.join("\n"));
    const output = json("analyze", "--counts", low, "--baseline", "0.04", "--mde", "0.1", "--power", "0.8", "--max-days", "60");
    const days = output.days as { call: string; sequential: { cs: [number, number]; relativeCs: [number, number] } }[];
    const heldMinimum = days.filter((day) => day.sequential.cs[1] < 0.004 && day.sequential.relativeCs[1] >= 0.1);
    expect(heldMinimum.length).toBeGreaterThan(3); // an absolute-only rule would have called these days flat
    for (const day of heldMinimum) expect(day.call).toBe("collecting");
    for (const day of days.filter((entry) => entry.call === "flat")) {
      expect(day.sequential.relativeCs[1]).toBeLessThan(0.1);
      expect(day.sequential.cs[1]).toBeLessThan(0.004);
    }
    expect(days.at(-1)!.call).toBe("flat");
  });
  it("accepts a given τ and several treatment arms", () => {
    const three = path.join(folder, "three.csv");
    writeFileSync(three, "date,arm,units,conversions\n2026-03-01,holdout,100,10\n2026-03-01,treatment,100,12\n2026-03-01,variant-b,100,9\n");
    const output = json("analyze", "--counts", three, "--tau", "0.02");
    expect(output.tau).toBe(0.02);
    expect(Object.keys(output.days[0].byArm)).toEqual(["treatment", "variant-b"]);
    expect(output.armSignificanceLevel).toBe(0.025);
  });
});

describe("peeksafe boundaries and peeking-cost", () => {
  it("matches rpact getDesignGroupSequential(kMax = 4, alpha = 0.05, sided = 2, typeOfDesign = \"asOF\") (B's fixture)", () => {
    const reference = rpact.spending.find((e) => e.typeOfDesign === "asOF" && e.sided === 2 && e.alpha === 0.05 && e.informationRates.join() === "0.25,0.5,0.75,1")!;
    const output = json("boundaries", "--fractions", "0.25,0.5,0.75,1", "--alpha", "0.05", "--spending", "obf");
    output.z.forEach((z: number, i: number) => expect(Math.abs(z - reference.criticalValues[i]!)).toBeLessThanOrEqual(TOLERANCE.boundary));
    expect(output.cumulativeAlpha.at(-1)).toBeCloseTo(0.05, 12);
  });
  it("gives the error of 5 naive looks: Jennison & Turnbull (2000) Table 1.1, 0.142 (published table value, typed in)", () => {
    const output = json("peeking-cost", "--looks", "5");
    expect(Math.abs(output.errorRate - 0.142)).toBeLessThan(0.0005);
    expect(output.errorRate).toBe(naivePeekingError(equalFractions(5)));
    expect(json("peeking-cost", "--fractions", "0.5,1", "--alpha", "0.01").errorRate).toBe(naivePeekingError([0.5, 1], { significanceLevel: 0.01 }));
  });
});

describe("peeksafe srm", () => {
  it("matches scipy chisquare([5100, 4900], f_exp = [5000, 5000]) (tests/reference/srm-reference.py)", () => {
    const reference = srm.chiSquare.find((c) => c.counts.join() === "5100,4900")!;
    const output = json("srm", "--counts", "5100,4900", "--shares", "0.5,0.5");
    expect(closeRelative(output.chiSquare.statistic, reference.statistic, 1e-12)).toBe(true);
    expect(closeRelative(output.chiSquare.p, reference.p, TOLERANCE.pRelative)).toBe(true);
    expect(output.sequential.bayesFactor).toBeCloseTo(Math.exp(dirichletMultinomialLogBayesFactor([5100, 4900], [0.5, 0.5], 100)), 12);
    expect(output.sequential.p).toBe(Math.min(1, 1 / output.sequential.bayesFactor));
    expect(json("srm", "--counts", "5100,4900", "--shares", "0.5,0.5", "--prior-strength", "10").sequential.priorStrength).toBe(10);
  });
});

describe("peeksafe bad input → one line on stderr, exit 2", () => {
  const cases: [string[], RegExp][] = [
    [[], /usage: peeksafe/],
    [["launch"], /unknown command "launch"/],
    [["ztest", "--treatment", "13/10", "--holdout", "1/2"], /--treatment needs units ≥ 1 and conversions ≤ units/],
    [["ztest", "--treatment", "abc", "--holdout", "1/2"], /--treatment must be conversions\/units/],
    [["ztest", "--holdout", "1/2"], /--treatment is required/],
    [["ztest", "--treatment", "1/2", "--holdout", "1/2", "--sides", "3"], /--sides must be 1 or 2/],
    [["ztest", "--treatment", "1/2", "--holdout", "1/2", "--colour", "red"], /Unknown option '--colour'/],
    [["plan", "--baseline", "1.5", "--mde", "0.1"], /--baseline must be in \(0, 1\)/],
    [["plan", "--baseline", "0.6", "--mde", "1"], /sampleSizeTwoProportions requires a non-zero minimumLift with baselineRate·\(1 \+ minimumLift\) in \(0, 1\)/],
    [["plan", "--baseline", "0.1", "--mde", "0"], /--mde must be a non-zero relative lift/],
    [["plan", "--baseline", "0.1", "--mde", "0.1", "--daily-units=-3"], /--daily-units must be > 0/],
    [["plan", "--baseline", "0.1", "--mde", "0.1", "--daily-units", "-3"], /Option '--daily-units' argument is ambiguous/],
    [["analyze", "--tau", "0.1"], /--counts FILE.csv is required/],
    [["analyze", "--counts", "/no/such/file.csv", "--tau", "0.1"], /cannot read \/no\/such\/file.csv/],
    [["analyze", "--counts", "CSV"], /give --tau, or --baseline and --mde/],
    [["boundaries", "--fractions", "0.5,x", "--alpha", "0.05", "--spending", "obf"], /--fractions must be numbers separated by commas/],
    [["boundaries", "--fractions", "0.5,1", "--alpha", "0.05", "--spending", "linear"], /--spending must be obf, pocock or hsd/],
    [["boundaries", "--fractions", "0.7,0.5,1", "--alpha", "0.05", "--spending", "obf"], /spendingBoundaries requires/],
    [["peeking-cost", "--looks", "5", "--fractions", "0.5,1"], /give exactly one of --looks K or --fractions/],
    [["peeking-cost"], /give exactly one of --looks K or --fractions/],
    [["peeking-cost", "--looks", "2.5"], /--looks must be a whole number/],
    [["srm", "--counts", "1,2", "--shares", "0.5,0.6"], /sampleRatioChiSquare requires shares summing to 1/],
    [["srm", "--counts", "1,2", "--shares", "0.5,0.5", "--prior-strength", "0"], /--prior-strength must be > 0/],
  ];
  for (const [argv, message] of cases) {
    it(`rejects ${argv.join(" ") || "no command"}`, () => {
      const result = run(...argv.map((arg) => (arg === "CSV" ? csv : arg)));
      expect(result.exitCode).toBe(2);
      expect(result.stdout).toBe("");
      expect(result.stderr).toMatch(message);
      expect(result.stderr.trimEnd().split("\n")).toHaveLength(1);
    });
  }
  it("rejects a CSV with a bad line, naming the line", () => {
    const bad = path.join(folder, "bad.csv");
    writeFileSync(bad, "date,arm,units,conversions\n2026-03-01,holdout,100,7\n2026-03-01,treatment,=HYPERLINK(1),3\n2026-03-02,holdout,x,1\n");
    const result = run("analyze", "--counts", bad, "--tau", "0.01");
    expect(result.exitCode).toBe(2);
    expect(result.stderr).toBe(`peeksafe: analyze: ${bad} line 3: units "=HYPERLINK(1)" looks like a spreadsheet formula (and 1 more bad lines)\n`);
  });
  it("rejects a CSV without a holdout or without a treatment arm", () => {
    const noHoldout = path.join(folder, "no-holdout.csv");
    writeFileSync(noHoldout, "date,arm,units,conversions\n2026-03-01,control,100,7\n2026-03-01,treatment,100,3\n");
    expect(run("analyze", "--counts", noHoldout, "--tau", "0.01").stderr).toMatch(/has no rows for the arm "holdout"/);
    const onlyHoldout = path.join(folder, "only-holdout.csv");
    writeFileSync(onlyHoldout, "date,arm,units,conversions\n2026-03-01,holdout,100,7\n");
    expect(run("analyze", "--counts", onlyHoldout, "--tau", "0.01").stderr).toMatch(/has no treatment arm/);
  });
});

describe("npm run --silent peeksafe (the real process)", () => {
  const exec = promisify(execFile);
  const cwd = path.resolve(__dirname, "../..");
  it("prints one JSON object and exits 0", async () => {
    const { stdout, stderr } = await exec("npx", ["tsx", "bin/peeksafe.ts", "peeking-cost", "--looks", "5"], { cwd });
    expect(stderr).toBe("");
    expect(JSON.parse(stdout).errorRate).toBe(naivePeekingError(equalFractions(5)));
  }, 30_000);
  it("prints one line on stderr and exits 2 on bad input", async () => {
    const failure = await exec("npm", ["run", "--silent", "peeksafe", "--", "ztest", "--treatment", "x"], { cwd }).catch((error) => error);
    expect(failure.code).toBe(2);
    expect(failure.stdout).toBe("");
    expect(failure.stderr).toMatch(/^peeksafe: ztest: --treatment must be conversions\/units, e\.g\. 120\/1000\n$/);
  }, 30_000);
});
