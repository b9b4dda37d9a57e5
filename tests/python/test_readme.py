"""README.md's "From Python" session, run as written: its output is the ```text block after it."""
import os
import re
import subprocess
import sys


def test_readme_python_session(repo_root):
    with open(os.path.join(repo_root, "README.md"), encoding="utf-8") as f:
        text = f.read()
    section = text[text.index("## From Python"):]
    code = re.search(r"```python\n(.*?)```", section, re.S).group(1)
    expected = re.search(r"```text\n(.*?)```", section, re.S).group(1)
    assert len(code.strip().splitlines()) <= 12
    out = subprocess.run([sys.executable, "-c", code], check=True, capture_output=True, text=True)
    assert out.stderr == ""
    assert out.stdout == expected
