#!/usr/bin/env python3
"""Design two timing blocks of a bench power-supply controller from the parts on the
shelf, print a bill of materials and write a JSON report (a scenario of our own,
invented data).

    python3 bom_from_stock.py stock.csv report.json

Block 1, fault LED one-shot: on for 250 ms +/-20 % from -20 to +70 degC on a
4.5-5.5 V rail. Block 2, MCU reset delay: the reset pin stays low 20 to 80 ms after
the 3.3 V rail rises. Results are design estimates: verify them on hardware.
"""
import csv
import json
import sys

import tauforge as tf


def read_stock(path):
    """Resistor and capacitor value sets from a CSV with kind,value,tolerance,quantity."""
    parts = {"R": [], "C": []}
    with open(path, newline="", encoding="utf-8") as f:
        rows = csv.DictReader(line for line in f if not line.startswith("#"))
        for row in rows:
            if int(row["quantity"]) > 0:
                parts[row["kind"]].append((row["value"], row["tolerance"]))
    return tf.ResistorValues.from_list(parts["R"]), tf.CapacitorValues.from_list(parts["C"])


def main(stock_path, report_path):
    resistors, capacitors = read_stock(stock_path)
    blocks = [
        ("fault LED one-shot",
         tf.TimerMonostable(supply="4.5V..5.5V", temperature="-20..70"), {"pulse width": "250ms,20%"}),
        ("MCU reset delay",
         tf.RcDelay(supply="3.3V", threshold="0.6..0.7", temperature="-20..70"), {"delay": "20ms..80ms"}),
    ]
    report = {"stock": stock_path, "blocks": []}
    bom = []
    for title, network, spec in blocks:
        result = tf.synthesize(network, spec, resistors=resistors, capacitors=capacitors, top=3)
        if not result["feasible"]:
            print(f"{title}: {result['reason']}", file=sys.stderr)
            return 3
        best = result["designs"][0]
        mc = tf.monte_carlo(best["network"], spec, samples=20000, seed=1)
        for slot, part in best["parts"].items():
            unit = "Ω" if slot.startswith("R") else "F"
            bom.append((title, slot, tf.format(part["value"], unit), str(part["tolerance"]), best["margin"]))
        report["blocks"].append({
            "block": title,
            "network": best["network"].name,
            "spec": spec,
            "parts": {slot: {"value": p["value"], "tolerance": [p["tolerance"].minus, p["tolerance"].plus]}
                      for slot, p in best["parts"].items()},
            "worst_case": {"min": best["worst_min"], "max": best["worst_max"]},
            "margin": best["margin"],
            "yield": mc["yield"],
            "alternatives": [d["description"] for d in result["designs"][1:]],
        })

    print(f"{'block':<20} {'part':<4} {'value':>9} {'tolerance':>9} {'margin':>7}")
    for block, slot, value, tol, margin in bom:
        print(f"{block:<20} {slot:<4} {value:>9} {tol:>9} {margin:>7.1%}")
    with open(report_path, "w", encoding="utf-8") as f:
        json.dump(report, f, indent=2, ensure_ascii=False)
    print(f"report: {report_path}")
    return 0


if __name__ == "__main__":
    if len(sys.argv) != 3:
        print("usage: bom_from_stock.py STOCK.csv REPORT.json", file=sys.stderr)
        sys.exit(2)
    sys.exit(main(sys.argv[1], sys.argv[2]))
