"""The PNG encoder (render/png.py), decoded back by an independent reading of the format
(PNG second edition: chunk layout, CRC-32, IHDR fields, filter type 2 'Up')."""
from __future__ import annotations

import base64
import struct
import zlib

import numpy as np
import pytest

from generator.render import png


def _decode(data: bytes) -> tuple[dict, np.ndarray]:
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos, chunks = 8, []
    while pos < len(data):
        (n,) = struct.unpack(">I", data[pos:pos + 4])
        kind, body = data[pos + 4:pos + 8], data[pos + 8:pos + 8 + n]
        (crc,) = struct.unpack(">I", data[pos + 8 + n:pos + 12 + n])
        assert crc == zlib.crc32(kind + body) & 0xFFFFFFFF
        chunks.append((kind, body))
        pos += 12 + n
    assert [k for k, _ in chunks] == [b"IHDR", b"IDAT", b"IEND"]
    w, h, depth, colour, comp, filt, inter = struct.unpack(">IIBBBBB", chunks[0][1])
    head = {"width": w, "height": h, "depth": depth, "colour": colour, "interlace": inter}
    raw = np.frombuffer(zlib.decompress(chunks[1][1]), np.uint8).reshape(h, 1 + 3 * w)
    out = np.zeros((h, 3 * w), np.uint8)
    for r in range(h):
        f, line = raw[r, 0], raw[r, 1:]
        if f == 0:
            out[r] = line
        elif f == 2:
            out[r] = line + (out[r - 1] if r else 0)
        else:
            raise AssertionError(f"unexpected filter {f}")
    return head, out.reshape(h, w, 3)


def test_encoded_pixels_decode_back_exactly():
    rng = np.random.default_rng(7)
    a = rng.integers(0, 256, (13, 21, 3), dtype=np.uint8)
    head, back = _decode(png.encode_rgb(a))
    assert head == {"width": 21, "height": 13, "depth": 8, "colour": 2, "interlace": 0}
    assert np.array_equal(back, a)


def test_a_gradient_compresses_and_the_bytes_are_the_same_every_time():
    x = np.linspace(0, 255, 64).astype(np.uint8)
    a = np.stack(np.broadcast_arrays(x[None, :], x[:, None], np.full((64, 64), 128, np.uint8)), -1)
    data = png.encode_rgb(a)
    assert len(data) < a.nbytes / 4
    assert data == png.encode_rgb(a.copy())
    assert np.array_equal(_decode(data)[1], a)


def test_the_data_uri_carries_the_png_in_base64():
    a = np.zeros((2, 2, 3), np.uint8)
    uri = png.data_uri(a)
    assert uri.startswith("data:image/png;base64,")
    assert base64.b64decode(uri.split(",", 1)[1]) == png.encode_rgb(a)


def test_anything_but_an_rgb_image_is_refused():
    with pytest.raises(ValueError, match="expected an"):
        png.encode_rgb(np.zeros((4, 4), np.uint8))
