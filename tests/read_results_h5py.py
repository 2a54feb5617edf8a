"""Reads a heatbead results file with h5py (Debian's python3-h5py), as a user's script would.

Usage: python3 read_results_h5py.py RESULTS.h5
Checks the layout of post/HDF5_LAYOUT.md: fields shaped (nz, ny, nx) with units, NaN in void cells,
probes with time and temperature, the resolved case, and a closed energy balance.
"""
import math
import sys

import h5py
import numpy as np

with h5py.File(sys.argv[1], "r") as f:
    nz, ny = f["grid/tags"].shape
    nx = f["grid/x_faces"].shape[0] - 1
    peak = f["fields/peak_temperature"]
    assert peak.shape == (nz, ny, nx), peak.shape
    assert peak.attrs["unit"] in ("degC", b"degC"), peak.attrs["unit"]
    values = peak[...]
    void = f["grid/tags"][...] == 0
    assert np.all(np.isnan(values[void, :])), "void cells must be NaN"
    assert np.nanmax(values) > 1495, "the weld must have melted"
    assert "t8_5" in f["fields"], list(f["fields"])
    for name in ("haz_flange_mid_0.5mm", "root"):
        probe = f["probes"][name]
        assert probe["time"].shape == probe["temperature"].shape
    case = f["case"][()]
    assert b"[joint]" in (case if isinstance(case, bytes) else case.encode())
    error = float(f["summary/energy_balance_error"][()])
    assert math.isfinite(error) and abs(error) < 0.01, error
print("h5py read", sys.argv[1], "ok")
