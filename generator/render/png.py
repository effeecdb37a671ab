"""A minimal PNG encoder for an 8-bit RGB image (ISO/IEC 15948, PNG second edition):
signature, IHDR, one IDAT (zlib, every row with the 'Up' filter), IEND. Enough to embed
the diagrams' approximate colour fill in an SVG; deterministic bytes for the same pixels."""
from __future__ import annotations

import base64
import struct
import zlib

import numpy as np

SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _chunk(kind: bytes, data: bytes) -> bytes:
    # length, type, data, CRC-32 of type and data (PNG §5.3)
    return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data) & 0xFFFFFFFF)


def encode_rgb(pixels: np.ndarray) -> bytes:
    """PNG bytes of an (h, w, 3) uint8 array whose first row is the top of the image."""
    a = np.ascontiguousarray(pixels, dtype=np.uint8)
    if a.ndim != 3 or a.shape[2] != 3:
        raise ValueError(f"expected an (h, w, 3) array, found shape {a.shape}")
    h, w, _ = a.shape
    rows = a.reshape(h, w * 3)
    up = rows.copy()
    up[1:] = rows[1:] - rows[:-1]          # filter type 2 'Up' (PNG §9.2), modulo 256 by uint8 arithmetic
    raw = np.concatenate([np.full((h, 1), 2, np.uint8), up], axis=1).tobytes()
    ihdr = struct.pack(">IIBBBBB", w, h, 8, 2, 0, 0, 0)  # 8-bit truecolour, deflate, no interlace
    return SIGNATURE + _chunk(b"IHDR", ihdr) + _chunk(b"IDAT", zlib.compress(raw, 9)) + _chunk(b"IEND", b"")


def data_uri(pixels: np.ndarray) -> str:
    return "data:image/png;base64," + base64.b64encode(encode_rgb(pixels)).decode("ascii")
