"""What the brief and the envelope import while they compute (start-up, issue: speed).

numpy's masked arrays (numpy.ma, tens of millions of instructions to import) are not needed by
any computation of the brief or the envelope; numpy imports them on first use of some functions
(e.g. numpy.unique without an inverse, which asks numpy.ma whether its input is masked), so a
first brief of a process would pay for that import.
"""

from __future__ import annotations

import subprocess
import sys


def test_a_brief_and_an_envelope_do_not_import_numpy_masked_arrays():
    code = ("import sys\nfrom briefer.brief import build_brief, demo_request, envelope_for\n"
            "req = demo_request()\nbuild_brief(req, computed_utc='x')\nenvelope_for(req)\n"
            "print('numpy.ma' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip().splitlines()[-1] == "False"
