"""Crash safety of `adsorb run`: a run killed mid-way leaves no output folder (issue: reliability).

Each test starts the real command in a child process, waits until the run is computing
(its hidden temporary folder exists) and sends a signal.
"""

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from adsorb.cli import main

CASES = Path(__file__).resolve().parent.parent / "cases"
DEMO = CASES / "ammonia_mx0001.toml"

pytestmark = pytest.mark.skipif(os.name != "posix", reason="POSIX signals")


def _start_and_wait(out: Path):
    """Start `adsorb run DEMO --out out` and return the process once its temporary folder exists."""
    proc = subprocess.Popen([sys.executable, "-m", "adsorb", "run", str(DEMO), "--out", str(out)],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 120.0
    while not list(out.parent.glob(f".{out.name}.partial-*")):
        if proc.poll() is not None or time.monotonic() > deadline:
            proc.kill()
            pytest.fail(f"the run ended or stalled before computing: {proc.communicate()}")
        time.sleep(0.01)
    return proc


@pytest.mark.parametrize("sig", [signal.SIGTERM, signal.SIGINT], ids=["SIGTERM", "SIGINT"])
def test_signal_mid_run_leaves_nothing(tmp_path, sig):
    """SIGTERM or SIGINT while computing: exit 128 + signal, one line, no DIR, no temporary folder."""
    out = tmp_path / "out"
    proc = _start_and_wait(out)
    proc.send_signal(sig)
    _, err = proc.communicate(timeout=60)
    # shell convention for death by signal (common practice)
    assert proc.returncode == 128 + int(sig), (proc.returncode, err)
    assert err.strip().splitlines()[-1].startswith("adsorb: ") and "Traceback" not in err, err
    assert list(tmp_path.iterdir()) == []


def test_sigkill_leaves_no_output_folder_and_the_next_run_sweeps_the_leftover(tmp_path):
    """SIGKILL cannot be caught: no DIR appears, and the next run into DIR removes the dead run's folder."""
    out = tmp_path / "out"
    proc = _start_and_wait(out)
    proc.kill()
    proc.communicate(timeout=60)
    assert proc.returncode == -signal.SIGKILL
    assert not out.exists()
    leftovers = list(tmp_path.glob(".out.partial-*"))
    assert len(leftovers) == 1 and str(proc.pid) in leftovers[0].name
    assert main(["run", str(CASES / "orr_fictitious_sites.toml"), "--out", str(out)]) == 0
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]
