#!/usr/bin/env python3
"""Every page heatbead writes says how it was computed, under its caution, and the files carry the bands.

  how_computed_pages.py HEATBEAD SOURCE_DIR WORKDIR

Runs, on coarse short cases (about a minute in all): `run` (report.html, summary.json, summary.csv),
`preheat` (preheat.html, preheat.json), `compare` without its preheat search (compare.html,
compare.json) and `sweep` of two points with the bands turned on (report.html, table.csv). Each page
must hold the block "How this was computed" right after the caution, with the grid, the integrator,
the heat source, how sure the answers are and the model's known limits (and the hardness model and
limit where the case has a composition); the pages with bands their "How sure" section; the JSON
and CSV files the bands' low and high ends.
Exit 0 on success, 1 with a message otherwise.
"""
import csv
import json
import os
import re
import shutil
import subprocess
import sys

COARSE = ["--set", "grid.finest=1.5", "--set", "grid.along_weld=2", "--set", "joint.length=40",
          "--set", "output.station=20"]


def fail(message):
    print("FAIL: " + message)
    sys.exit(1)


def heatbead(exe, args, out):
    shutil.rmtree(out, ignore_errors=True)
    done = subprocess.run([exe] + args + ["--out", out], capture_output=True, text=True)
    if done.returncode != 0:
        fail(" ".join(args) + " exited " + str(done.returncode) + ":\n" + done.stdout + done.stderr)
    return done.stdout


def read(path):
    with open(path, encoding="utf-8") as f:
        return f.read()


def check_page(path, hardness, bands):
    html = read(path)
    caution = html.find('<div class="caution"')
    block = html.find('<div class="how-computed">')
    if caution < 0 or block < 0:
        fail(path + ": no caution or no how-computed block")
    # Under the caution: nothing but the caution's own closing tag between the two.
    if html[caution:block].count("</div>") != 1:
        fail(path + ": the how-computed block does not follow the caution")
    body = html[block:html.find("</div>", block)]
    rows = ["grid", "integrator", "heat source", "how sure", "known limits"]
    if hardness:
        rows += ["hardness model", "hardness limit"]
    for row in rows:
        if '<th scope="row">' + row not in body:
            fail(path + ": the how-computed block has no row '" + row + "'")
    if "not recorded" in body:
        fail(path + ": the block says it was not recorded")
    if bands and '<section class="bands"><h2>How sure</h2>' not in html:
        fail(path + ": no 'How sure' section")
    if bands and 'id="figure-band-' not in html:
        fail(path + ": no band figure")


def band_ends(item, where):
    if not (isinstance(item.get("low"), (int, float)) and isinstance(item.get("high"), (int, float))):
        fail(where + ": no numeric low and high: " + json.dumps(item))
    if not item["low"] <= item["value"] <= item["high"]:
        fail(where + ": the value lies outside its band: " + json.dumps(item))


def main(exe, source, work):
    demo = os.path.join(source, "cases", "demo_tee_15mm.toml")
    out = os.path.join(work, "run")
    heatbead(exe, ["run", demo] + COARSE + ["--set", "output.probes=[[20,10,-2]]",
                                             "--set", 'output.files=["summary","report"]'], out)
    check_page(os.path.join(out, "report.html"), hardness=True, bands=True)
    summary = json.loads(read(os.path.join(out, "summary.json")))
    for key in ["penetration_flange", "penetration_web", "fused_area", "t8_5_min", "t8_5_max", "cooling_rate_540",
                "haz_hardness_max"]:
        band_ends(summary[key], "summary.json " + key)
    with open(os.path.join(out, "summary.csv"), newline="") as f:
        rows = {r["key"]: r for r in csv.DictReader(f)}
    if not rows["fused_area"]["low"] or not rows["fused_area"]["high"]:
        fail("summary.csv: fused_area has no low and high")
    if rows["heat_input"]["low"] or rows["heat_input"]["high"]:
        fail("summary.csv: heat_input, which carries no band, has low or high")

    out = os.path.join(work, "preheat")
    heatbead(exe, ["preheat", os.path.join(source, "tests", "cases", "preheat_thick.toml")], out)
    check_page(os.path.join(out, "preheat.html"), hardness=True, bands=True)
    preheat = json.loads(read(os.path.join(out, "preheat.json")))
    across = preheat["band"]["across_band_degC"]
    if not isinstance(across, (int, float)) or across < preheat["simulation_preheat_degC"]:
        fail("preheat.json: the preheat across the band is missing or below the nominal one: " + json.dumps(preheat["band"]))
    band_ends(preheat["band"]["checks"][0]["hardness_HV"], "preheat.json checks[0].hardness_HV")

    out = os.path.join(work, "compare")
    heatbead(exe, ["compare", os.path.join(source, "cases", "compare_short_circuit.toml"),
                   os.path.join(source, "cases", "compare_spray.toml"), "--no-preheat"] + COARSE, out)
    check_page(os.path.join(out, "compare.html"), hardness=False, bands=True)
    for case in json.loads(read(os.path.join(out, "compare.json")))["cases"]:
        band_ends(case["bands"]["penetration_flange"], "compare.json " + case["name"] + " penetration_flange")

    out = os.path.join(work, "sweep")
    heatbead(exe, ["sweep", os.path.join(source, "tests", "cases", "sweep_bands.toml"), "--quiet"], out)
    check_page(os.path.join(out, "report.html"), hardness=False, bands=False)
    with open(os.path.join(out, "table.csv"), newline="") as f:
        table = list(csv.DictReader(f))
    for r in table:
        low, high, value = (float(r[k]) for k in ("penetration_flange_low [mm]", "penetration_flange_high [mm]",
                                                 "penetration_flange [mm]"))
        if not low <= value <= high:
            fail("table.csv point %s: penetration %g outside its band %g to %g" % (r["point"], value, low, high))
    if "bars: each point&#39;s band" not in read(os.path.join(out, "report.html")):
        fail("sweep report.html: the points' bands are not drawn")
    print("every page has its how-computed block; the files carry the bands")


if __name__ == "__main__":
    if len(sys.argv) != 4:
        fail(__doc__)
    main(*sys.argv[1:])
