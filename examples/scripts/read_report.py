#!/usr/bin/env python3
"""Drive tauforge from Python and read its JSON reports.

Designs the demo board's buzzer oscillator (2.4 kHz +/- 10 %, duty 55 % .. 65 %), prints
the chosen parts with their worst case and Monte Carlo yield, then asks for production
test limits of the chosen parts and prints the tester's acceptance window.

    python3 examples/scripts/read_report.py [--tauforge PATH]

Every number of a report is {"value": <SI base units>, "unit": ..., "text": ...}.
"""
import argparse
import json
import subprocess
import sys


def tauforge(exe, *args):
    """Runs tauforge with --json; returns (exit status, report or None)."""
    run = subprocess.run([exe, *args, "--json"], capture_output=True, text=True)
    if run.returncode not in (0, 3, 4):  # 2 and 1: no report, one line on stderr
        sys.exit(f"tauforge failed ({run.returncode}): {run.stderr.strip()}")
    return run.returncode, json.loads(run.stdout)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--tauforge", default="tauforge", help="the tauforge executable")
    exe = parser.parse_args().tauforge

    common = ["--set", "supply=4.5V..5.5V", "--set", "lower-threshold=1/3+-0.005",
              "--set", "upper-threshold=2/3+-0.005", "--temp=-20..70"]
    status, report = tauforge(exe, "design", "timer_astable", *common,
                              "--spec", "frequency=2.4kHz,10%", "--spec", "duty=55%..65%",
                              "--part", "C=C0G", "--resistors", "E96,1k..220k",
                              "--capacitors", "E12,1n..100n,2%", "--top", "3", "--samples", "20000")
    design = report["design"]
    if status == 3:
        sys.exit("no design: " + design["reason"])

    best = design["best"]
    print("buzzer oscillator, design 1 of", len(design["designs"]))
    for part in best["parts"]:
        print(f"  {part['name']:3} {part['value']['text']:>9} {part['tolerance']['text']:>6} ({part['origin']})")
    for metric in best["metrics"]:
        if metric["spec"] is None:
            continue
        wc = metric["worst_case"]
        print(f"  {metric['name']:10} {wc['min']['text']} .. {wc['max']['text']} at worst case, "
              f"window {metric['spec']['window']['text']}, Monte Carlo yield {metric['spec']['yield']['text']}")

    # Production test limits for the parts just chosen: read their values back from the report.
    parts = [f"{p['name']}={p['value']['value']!r},{p['tolerance']['text'].replace(' ', '')}" for p in best["parts"]]
    args = ["limits", "timer_astable", *common, "--spec", "frequency=2.4kHz,10%", "--uncertainty", "0.2%",
            "--samples", "20000"]
    for p in parts:
        args += ["--part", p + (",C0G" if p.startswith("C=") else "")]
    _, limits = tauforge(exe, *args)
    for row in limits["limits"]:
        print(f"  test: accept {row['metric']} in {row['acceptance']['text']} "
              f"(guard {row['uncertainty']['expanded']['text']}); "
              f"false rejects {100 * row['rates']['false_reject_rate']:.3g} %")


if __name__ == "__main__":
    main()
