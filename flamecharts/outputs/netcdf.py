"""results.nc: the results as a netCDF file any netCDF tool reads (xarray, ncdump, Panoply, MATLAB).

Written with xarray's ``scipy`` engine, which writes netCDF-3 (64-bit offset) through
SciPy alone: no HDF5 or netCDF-C library to install (h5netcdf and netCDF4 would add
h5py or libnetcdf, 10-40 MB, for features a table of this size does not need).
netCDF-3 has no string type; xarray stores text as UTF-8 character arrays and reads
them back as strings.
"""
from __future__ import annotations

import os
import tempfile
from pathlib import Path

import xarray as xr


def write_netcdf(ds: xr.Dataset, path: Path) -> Path:
    """Write ``ds`` to ``path`` whole (a reader never sees half a file)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=path.name + ".")
    os.close(fd)
    try:
        ds.to_netcdf(tmp, engine="scipy", format="NETCDF3_64BIT")
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        os.replace(tmp, path)
    except BaseException:
        os.unlink(tmp)
        raise
    return path
