"""deltag.run_samples: a table of samples through one case, as `deltag batch` does, and the
same over a Dask cluster (a LocalCluster of two worker processes), row for row."""

import csv
import functools
import json
import os
import pathlib
import subprocess

import pytest

import deltag

ROOT = pathlib.Path(__file__).resolve().parents[2]
CASE = str(ROOT / "cases" / "hard-well.toml")
SAMPLES = ROOT / "cases" / "hard-well-samples.csv"


def demo_rows():
    with open(SAMPLES, newline="", encoding="utf-8") as f:
        return list(csv.DictReader(f))


def test_rows_are_the_batch_commands_json(tmp_path):
    out = tmp_path / "batch.json"
    subprocess.run([os.environ["DELTAG_BINARY"], "batch", CASE, "--samples", str(SAMPLES), "--output", str(out)],
                   check=True, capture_output=True)
    from_command = json.loads(out.read_text(encoding="utf-8"))
    rows = deltag.run_samples(demo_rows(), case=CASE)
    assert rows == from_command
    assert len(rows) == len(demo_rows())  # the demo case has no steps: one row per sample
    assert all(r["status"] == "ok" for r in rows)


def test_a_bad_row_among_good_ones_keeps_its_place():
    rows = demo_rows()
    rows[1]["Ca (mg/L)"] = "a lot"
    out = deltag.run_samples(rows, case=CASE)
    assert [r["sample"] for r in out] == [r["sample"] for r in rows]
    assert out[1]["status"] == "bad input"
    assert "Ca" in out[1]["message"]
    assert all(r["status"] == "ok" for i, r in enumerate(out) if i != 1)


def test_a_bad_header_raises_with_the_column_and_a_suggestion():
    rows = [{"sample": "s1", "Cq (mg/L)": 40, "pH": 7.5}]
    with pytest.raises(deltag.InputError) as e:
        deltag.run_samples(rows, case=CASE)
    assert "Cq" in str(e.value)
    assert e.value.suggestion != ""


def test_a_dataframe_in_gives_a_dataframe_out_with_the_summary_and_any_thread_count():
    pandas = pytest.importorskip("pandas")
    df = pandas.read_csv(SAMPLES)
    one = deltag.run_samples(df, case=CASE, threads=1)
    two = deltag.run_samples(df, case=CASE, threads=2)
    assert isinstance(one, pandas.DataFrame)
    assert one.attrs["summary"] == f"{len(df)} solved"
    pandas.testing.assert_frame_equal(one, two)
    assert list(one["sample"]) == list(df["sample"])


def generated_rows(n):
    """n invented samples: the demo's rows with calcium, alkalinity and pH stepped."""
    base = demo_rows()
    rows = []
    for i in range(n):
        r = dict(base[i % len(base)])
        r["sample"] = f"generated {i:04d}"
        if r["Ca (mg/L)"]:  # one demo sample has no calcium measured: it stays so
            r["Ca (mg/L)"] = f"{float(r['Ca (mg/L)']) * (0.8 + 0.4 * (i % 11) / 10):.3f}"
        r["Alkalinity (mg/L as CaCO3)"] = f"{float(r['Alkalinity (mg/L as CaCO3)']) * (0.9 + 0.2 * (i % 7) / 6):.3f}"
        r["pH"] = f"{6.8 + 0.05 * (i % 13):.2f}"
        rows.append(r)
    return rows


def test_a_dask_cluster_gives_the_local_rows_row_for_row():
    distributed = pytest.importorskip("distributed")
    rows = generated_rows(240)
    local = deltag.run_samples(rows, case=CASE)
    shards = [rows[i:i + 60] for i in range(0, len(rows), 60)]
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                  dashboard_address=None) as cluster, distributed.Client(cluster) as client:
        futures = client.map(functools.partial(deltag.run_samples, case=CASE), shards)
        results = client.gather(futures)  # in shard order: the merge is deterministic
    merged = [row for shard in results for row in shard]
    assert merged == local
    assert len(merged) == 240
    assert sum(r["status"] == "ok" for r in merged) == 240
