"""Fuzz tests (hypothesis, bounded): the data-file loaders and the app's keys.

Random YAML trees, random bytes and random mutations of the demo files go through every loader
(profile, airfield, scenario, saved inputs, config); a file that loads must then brief or fail
with the project's own error. Random key sequences are queued into the app without waiting. No
exception other than a `BriefingError` may escape, and the app must keep running. Each test is
bounded (max_examples, no per-example deadline on this shared machine) and marked ``fuzz``.
"""

from __future__ import annotations

import asyncio
import os
import random
import tempfile
from pathlib import Path

import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from briefer.errors import BriefingError

pytestmark = [pytest.mark.fuzz, pytest.mark.slow]

ROOT = Path(__file__).resolve().parents[1]
DATA = ROOT
DEMO_FILES = sorted(p for d in ("profiles", "airfields_demo", "scenarios") for p in (DATA / d).glob("*.yaml"))
FUZZ = settings(max_examples=40, deadline=None, derandomize=True,
                suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])

scalars = (st.none() | st.booleans() | st.integers(-10**6, 10**6) | st.integers()
           | st.floats(allow_nan=True, allow_infinity=True) | st.text(max_size=30)
           | st.sampled_from(["aircraft-profile", "airfield", "scenario", "briefing-inputs", "V2RL",
                              "demo-twin", "27", "09", "RNAV (GPS) RWY 09", "terps-legacy", "icao"]))
trees = st.recursive(scalars, lambda inner: st.lists(inner, max_size=4)
                     | st.dictionaries(st.text(max_size=12) | st.sampled_from(
                         ["kind", "name", "ident", "runways", "approaches", "configurations", "vref_kt",
                          "weather", "profile", "airfield", "landing_runway"]), inner, max_size=5),
                     max_leaves=25)


def _load_everything(data: bytes) -> None:
    """Every loader on `data`: a model or a BriefingError, nothing else."""
    from briefer.io.yamlload import load_bytes
    from briefer.instructor.scenario_format import load_scenario
    from briefer.tui.inputs_file import inputs_from_bytes

    for kind in (None, "aircraft-profile", "airfield"):
        try:
            model = load_bytes(data, file="fuzz.yaml", expected_kind=kind)
        except BriefingError:
            continue
        str(model)
    try:
        inputs_from_bytes(data, file="fuzz.yaml")
    except BriefingError:
        pass
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "fuzz.yaml"
        path.write_bytes(data)
        try:
            load_scenario(path)
        except BriefingError:
            pass
        from briefer.io.catalog import load_config

        try:
            load_config(path)
        except BriefingError:
            pass


def _dump(tree: object) -> bytes:
    return yaml.safe_dump(tree, allow_unicode=True).encode("utf-8", "surrogatepass")


@FUZZ
@given(trees)
def test_random_yaml_trees(tree):
    _load_everything(_dump(tree))


@FUZZ
@given(st.binary(max_size=400))
def test_random_bytes(data):
    _load_everything(data)


def _leaves(node, path=()):
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _leaves(v, path + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _leaves(v, path + (i,))
    else:
        yield path


def _set(node, path, value):
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value


@FUZZ
@given(st.sampled_from(DEMO_FILES), st.integers(0, 10**9), scalars)
def test_random_values_in_the_demo_files(path, pick, value):
    """One field of a demo file given a random value: the file loads and briefs, or one error."""
    tree = yaml.safe_load(path.read_text(encoding="utf-8"))
    leaves = list(_leaves(tree))
    _set(tree, leaves[pick % len(leaves)], value)
    data = _dump(tree)
    _load_everything(data)
    _brief_if_loadable(data)


@FUZZ
@given(st.sampled_from(DEMO_FILES), st.lists(st.tuples(st.integers(0, 10**6), st.integers(0, 40),
                                                        st.binary(max_size=12)), min_size=1, max_size=4))
def test_random_byte_mutations_of_the_demo_files(path, edits):
    data = bytearray(path.read_bytes())
    for at, cut, insert in edits:
        at %= len(data) + 1
        data[at:at + cut] = insert
    _load_everything(bytes(data))


def _brief_if_loadable(data: bytes) -> None:
    """A profile or airfield that loads briefs with the demo case, or fails with a BriefingError
    (`check` and `brief` accept the same files)."""
    from briefer.brief import build_brief, demo_request
    from briefer.io.yamlload import load_bytes
    from briefer.model import AircraftProfile, BriefRequest

    try:
        model = load_bytes(data, file="fuzz.yaml")
    except BriefingError:
        return
    base = demo_request()
    try:
        if isinstance(model, AircraftProfile):
            request = BriefRequest(profile=model, airfield=base.airfield, approach=base.approach,
                                   landing_runway=base.landing_runway, weather=base.weather)
        else:
            appr = model.approaches[0]
            runway = model.runways[0].threshold_a.designator
            request = BriefRequest(profile=base.profile, airfield=model, approach=appr.name,
                                   landing_runway=runway, weather=base.weather)
        build_brief(request)
    except BriefingError:
        pass


# --- the app: keys queued without waiting ------------------------------------------------------------
APP_KEYS = list("0123456789/GVRKTabz .-") + [
    "tab", "shift+tab", "up", "down", "left", "right", "enter", "escape", "backspace", "home", "end",
    "pageup", "pagedown", "ctrl+p", "ctrl+s", "ctrl+o", "ctrl+n", "ctrl+k", "ctrl+g", "ctrl+t", "f1", "space"]


async def _run_keys(batches: list[list[str]]) -> None:
    from test_app_fuzz import send_keys
    from test_app_support import demo_catalog, demo_inputs, settle

    from briefer.tui.app import BriefingApp

    app = BriefingApp(demo_catalog(), demo_inputs(), ascii=False, debounce_s=0.05)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        for keys in batches:
            send_keys(app, keys)               # all at once, as a paste or a fast typist sends them
            for _ in range(3):
                await pilot.pause(0.02)
            assert app.is_running
        for _ in range(8):
            if app.screen is app.main:
                break
            await pilot.press("escape")
        assert app.is_running
    assert app.return_code in (None, 0)


@settings(max_examples=12, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(st.lists(st.lists(st.sampled_from(APP_KEYS), min_size=1, max_size=10), min_size=1, max_size=4))
def test_random_app_keys_queued_without_waiting(batches):
    old = os.getcwd()
    with tempfile.TemporaryDirectory() as folder:    # a random enter in a dialog writes here
        os.chdir(folder)
        try:
            asyncio.run(_run_keys(batches))
        finally:
            os.chdir(old)


def test_the_palette_and_dialog_sequences_of_the_review():
    """The two sequences that ended the app, and a seeded long run of every key."""
    rng = random.Random(17)
    batches = [["ctrl+p", "pagedown"], ["escape"], ["ctrl+s", "shift+tab", "enter", "escape"],
               ["ctrl+o", "shift+tab", "enter", "escape"]]
    batches += [rng.choices(APP_KEYS, k=8) for _ in range(6)]
    old = os.getcwd()
    with tempfile.TemporaryDirectory() as folder:
        os.chdir(folder)
        try:
            asyncio.run(_run_keys(batches))
        finally:
            os.chdir(old)
