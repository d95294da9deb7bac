"""Draw the app icon: two discs of dissimilar metals touching, on a dark tile.

Writes site_src/static/icon.svg, icon-192.png and icon-512.png. The PNGs are
drawn here pixel by pixel (4x4 supersampled) with the standard library only,
so regenerating them needs nothing installed. Run by hand after changing the
design: python3 tools/make_icons.py
"""

import struct
import zlib
from pathlib import Path

STATIC = Path(__file__).resolve().parent.parent / "site_src" / "static"
BACKGROUND = (22, 48, 56)
ZINC = (170, 178, 186)
COPPER = (204, 112, 56)
GAP = (240, 200, 80)
# Shapes in a 0..1 square: (centre x, centre y, radius, colour), drawn in order.
DISCS = [(0.37, 0.5, 0.24, ZINC), (0.63, 0.5, 0.24, COPPER)]
SPARK = (0.5, 0.5, 0.05, GAP)
CORNER = 0.18


def _colour(x, y):
    cx = min(max(x, CORNER), 1 - CORNER)
    cy = min(max(y, CORNER), 1 - CORNER)
    if (x - cx) ** 2 + (y - cy) ** 2 > CORNER ** 2:
        return None
    colour = BACKGROUND
    for dx, dy, r, c in DISCS + [SPARK]:
        if (x - dx) ** 2 + (y - dy) ** 2 <= r * r:
            colour = c
    return colour


def png(size):
    sub = 4
    rows = []
    for j in range(size):
        row = bytearray([0])
        for i in range(size):
            acc = [0, 0, 0, 0]
            for sj in range(sub):
                for si in range(sub):
                    c = _colour((i + (si + 0.5) / sub) / size, (j + (sj + 0.5) / sub) / size)
                    if c is not None:
                        acc[0] += c[0]
                        acc[1] += c[1]
                        acc[2] += c[2]
                        acc[3] += 255
            n = sub * sub
            alpha = acc[3] // n
            if alpha:
                cover = acc[3] / 255
                row += bytes([round(acc[0] / cover), round(acc[1] / cover), round(acc[2] / cover), alpha])
            else:
                row += bytes(4)
        rows.append(bytes(row))

    def chunk(kind, data):
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data))

    header = struct.pack(">IIBBBBB", size, size, 8, 6, 0, 0, 0)
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", header)
            + chunk(b"IDAT", zlib.compress(b"".join(rows), 9)) + chunk(b"IEND", b""))


def svg():
    def hexc(c):
        return "#%02x%02x%02x" % c
    shapes = [f'<rect width="512" height="512" rx="{CORNER * 512:.0f}" fill="{hexc(BACKGROUND)}"/>']
    for x, y, r, c in DISCS + [SPARK]:
        shapes.append(f'<circle cx="{x * 512:.0f}" cy="{y * 512:.0f}" r="{r * 512:.0f}" fill="{hexc(c)}"/>')
    return ('<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512">'
            + "".join(shapes) + "</svg>\n")


if __name__ == "__main__":
    (STATIC / "icon.svg").write_text(svg())
    for size in (192, 512):
        (STATIC / f"icon-{size}.png").write_bytes(png(size))
