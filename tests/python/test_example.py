"""examples/python/bom_from_stock.py on its stock list: a BOM on stdout and a JSON report
whose designs hold their specs at worst case."""
import json
import os
import subprocess
import sys


def test_bom_from_stock(repo_root, tmp_path):
    example = os.path.join(repo_root, "examples", "python")
    report = tmp_path / "report.json"
    out = subprocess.run([sys.executable, os.path.join(example, "bom_from_stock.py"),
                          os.path.join(example, "stock.csv"), str(report)], check=True, capture_output=True, text=True)
    lines = out.stdout.splitlines()
    assert lines[0].split() == ["block", "part", "value", "tolerance", "margin"]
    assert len(lines) == 1 + 4 + 1                 # two parts per block, then the report line
    data = json.loads(report.read_text(encoding="utf-8"))
    assert [b["network"] for b in data["blocks"]] == ["timer_monostable", "rc_delay"]
    one_shot = data["blocks"][0]
    assert one_shot["margin"] >= 0
    lo, hi = one_shot["worst_case"]["min"]["pulse width"], one_shot["worst_case"]["max"]["pulse width"]
    assert 0.200 <= lo <= hi <= 0.300              # 250 ms +/-20 %
    assert all(b["yield"]["estimate"] >= b["yield"]["low"] for b in data["blocks"])
