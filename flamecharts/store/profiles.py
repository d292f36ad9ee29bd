"""How a converged flame profile is kept in the store: compact, and exactly what a warm start gets.

A stored profile is only ever a warm-start guess for a neighbouring flame: Cantera's
Newton solver converges it again to its own tolerances, so it needs the shape of the
flame, not its last digits. It is kept as:

- grid: float64 as solved (a few hundred values; exact positions keep the refined grid);
- T and velocity: float32 (relative precision 6e-8);
- Y: float32 rounded to Y_MANTISSA_BITS bits of mantissa (relative precision 2^-17, about
  8e-6, with float32's full exponent range, so trace species keep their order of
  magnitude; values below Y_FLOOR = 1e-10 become 0): "bit rounding", Klöwer, Razinger,
  Dominguez, Düben & Palmer, Nature Computational Science 1 (2021) 713-724. The floor takes
  the many trace values of a big mechanism out of the compressed stream (GRI-Mech 3.0:
  about 66 -> 54 KB a flame) and changes nothing a warm start needs: three GRI-Mech 3.0
  warm starts (phi 1.0 -> 0.9, 0.8 -> 0.7, 1.2 -> 1.1) took the same time (3.6, 3.8, 5.5 s)
  and grid points with and without it, flame speeds equal to 1e-9.

Fewer bits do not pay: rounding is noise from one grid point to the next, and a warm start
reads the profile through a cubic onto grids that Cantera's refiner builds from its
curvature, which that noise inflates. Measured on an h2o2 warm start (0.31 s from the
float64 profile): 16 bits 0.32 s, 14 bits 0.58 s, 12 bits 0.73 s, 10 bits 58 s.

The float32 arrays are stored as differences of their bit patterns along the grid
(smooth profiles: small differences; exact, modulo 2^32), every array byte-shuffled (the
bytes of equal significance together, as HDF5's shuffle filter does) and the lot
compressed with LZMA (Python's lzma). A GRI-Mech 3.0 flame of 780-935 grid points takes
48-56 KB instead of about 340 KB as float64 npz (docs/benchmarks.md).

Resume stays bit-identical: the run loop hands an in-run warm start the decoded stored
form (sweep.run), exactly what a resumed run reads back from the store.
"""
from __future__ import annotations

import io
import json
import lzma
import struct

import numpy as np
import numpy.typing as npt

#: First bytes of a profile in this format (older stores hold numpy .npz blobs, 'PK').
MAGIC = b"FCP3"
#: Mantissa bits kept of each mass fraction (float32 has 23).
Y_MANTISSA_BITS = 16
#: Mass fractions below this are stored as 0 (trace values no warm start needs).
Y_FLOOR = 1e-10


def bitround(a: np.ndarray, keep: int) -> np.ndarray:
    """``a`` as float32 rounded to ``keep`` mantissa bits, round to nearest, ties to even
    (Klöwer et al. 2021); the dropped bits are zero, which compresses well.

    >>> bitround(np.array([1.0, 1.0 + 2**-12, 3.14159]), 10).tolist()
    [1.0, 1.0, 3.140625]
    """
    a = np.ascontiguousarray(a, dtype=np.float32)
    drop = 23 - keep
    if drop <= 0:
        return a.copy()
    b = a.view(np.uint32).astype(np.uint64)
    half_minus_one = (1 << (drop - 1)) - 1
    b = (b + half_minus_one + ((b >> drop) & 1)) & ~np.uint64((1 << drop) - 1)
    return np.minimum(b, 0xFFFFFFFF).astype(np.uint32).view(np.float32).reshape(a.shape)


def _shuffled(a: np.ndarray) -> bytes:
    a = np.ascontiguousarray(a)
    return np.ascontiguousarray(a.view(np.uint8).reshape(-1, a.itemsize).T).tobytes()


def _unshuffled(buf: bytes, dtype, shape) -> np.ndarray:
    dt = np.dtype(dtype)
    n = int(np.prod(shape))
    return (np.frombuffer(buf, dtype=np.uint8).reshape(dt.itemsize, n).T.copy().view(dt).reshape(shape))


def _delta(a: np.ndarray) -> np.ndarray:
    """float32 -> differences of its bit patterns along the last axis (uint32, wrapping)."""
    u = np.ascontiguousarray(a, dtype=np.float32).view(np.uint32)
    return np.diff(u, axis=-1, prepend=np.zeros(u.shape[:-1] + (1,), dtype=np.uint32))


def _undelta(d: np.ndarray) -> np.ndarray:
    return np.cumsum(d, axis=-1, dtype=np.uint32).view(np.float32)


def floored(Y: npt.ArrayLike) -> np.ndarray:
    """Mass fractions with every |Y| < Y_FLOOR set to 0.

    >>> floored(np.array([0.2, 3e-11, -1e-12, 2e-10])).tolist()
    [0.2, 0.0, 0.0, 2e-10]
    """
    Y = np.array(Y, dtype=np.float64)
    Y[np.abs(Y) < Y_FLOOR] = 0.0
    return Y


def encode(profile: dict) -> bytes:
    """Profile dict (grid, T, velocity, Y[species x points], species, P) -> bytes."""
    arrays = [np.asarray(profile["grid"], dtype=np.float64), _delta(np.asarray(profile["T"], dtype=np.float32)),
              _delta(np.asarray(profile["velocity"], dtype=np.float32)),
              _delta(bitround(floored(profile["Y"]), Y_MANTISSA_BITS))]
    head = json.dumps({"species": list(profile["species"]), "P": float(profile["P"]),
                       "arrays": [[a.dtype.str, list(a.shape)] for a in arrays]}).encode()
    body = lzma.compress(b"".join(_shuffled(a) for a in arrays), preset=6)
    return MAGIC + struct.pack("<I", len(head)) + head + body


def decode(blob: bytes) -> dict:
    """bytes -> profile dict with float64 arrays (this format or an older store's .npz)."""
    if blob[:4] != MAGIC:
        with np.load(io.BytesIO(blob)) as z:
            return {"grid": z["grid"], "T": z["T"], "velocity": z["velocity"], "Y": z["Y"],
                    "species": [str(s) for s in z["species"]], "P": float(z["P"])}
    (n,) = struct.unpack("<I", blob[4:8])
    head = json.loads(blob[8:8 + n])
    body = lzma.decompress(blob[8 + n:])
    out, at = [], 0
    for dtype, shape in head["arrays"]:
        size = np.dtype(dtype).itemsize * int(np.prod(shape))
        a = _unshuffled(body[at:at + size], dtype, shape)
        out.append((a if a.dtype == np.float64 else _undelta(a)).astype(np.float64))
        at += size
    grid, T, velocity, Y = out
    return {"grid": grid, "T": T, "velocity": velocity, "Y": Y, "species": head["species"], "P": head["P"]}
