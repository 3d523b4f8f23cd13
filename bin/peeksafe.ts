/**
 * The `peeksafe` command line: `npm run --silent peeksafe -- <command> [options]`.
 *
 *   ztest --treatment X/N --holdout X/N [--sides 1|2] [--alpha A]
 *   plan --baseline P --mde R [--alpha A] [--power B] [--sides 1|2] [--holdout-share H] [--daily-units U]
 *   analyze --counts FILE.csv [--alpha A] [--tau T] [--baseline P --mde R [--power B] [--sd S]]
 *           [--sides 1|2] [--max-days D] [--holdout-share H]   (default: equal planned shares)
 *   boundaries --fractions F1,...,1 --alpha A [--sides 1|2] --spending obf|pocock|hsd [--gamma G]
 *   peeking-cost (--looks K | --fractions F1,...,1) [--alpha A]
 *   srm --counts C1,C2,... --shares S1,S2,... [--prior-strength K]
 *
 * Prints one JSON object on stdout and exits 0 (±Infinity is printed as null); bad input prints
 * one line on stderr and exits 2.
 */
import { readFileSync } from "node:fs";
import { runCli } from "./peeksafe-cli";

const result = runCli(process.argv.slice(2), (path) => readFileSync(path, "utf8"));
process.stdout.write(result.stdout);
process.stderr.write(result.stderr);
process.exitCode = result.exitCode;
