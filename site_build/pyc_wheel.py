"""Turn a pure-Python wheel into a byte-compiled one, inside Pyodide.

Run by ``site_build/pyodide_compile.mjs`` in Pyodide's own interpreter, because a
``.pyc`` file is only valid for the exact Python minor version that wrote it
and no host CPython matches Pyodide's. Each ``.py`` module is replaced by a
sourceless ``.pyc`` beside it (the layout Pyodide uses for its own packages),
compiled with ``UNCHECKED_HASH`` so that the output depends on the source
only, never on a file time. Every other member is copied unchanged; WHEEL's
tag and RECORD are rewritten to describe what the new wheel holds.

The output zip is deterministic: members sorted, fixed timestamps and modes.
"""

import base64
import hashlib
import os
import py_compile
import shutil
import sys
import zipfile

EPOCH = (1980, 1, 1, 0, 0, 0)


def _record_line(arcname, data):
    digest = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=")
    return f"{arcname},sha256={digest.decode()},{len(data)}"


def write_wheel(out_path, members, dist_info):
    """Write ``members`` ({arcname: bytes}) as a deterministic wheel.

    Package files come first, then ``dist_info``'s files, then a freshly
    computed RECORD (any RECORD in ``members`` is replaced). Shared by
    build.py for the noblegap wheel, so every wheel of the site is written
    the same way.
    """
    record_key = f"{dist_info}/RECORD"
    members = {k: v for k, v in members.items() if k != record_key}
    order = sorted(k for k in members if not k.startswith(dist_info + "/"))
    order += sorted(k for k in members if k.startswith(dist_info + "/"))
    record = [_record_line(k, members[k]) for k in order] + [f"{record_key},,"]
    members[record_key] = ("\n".join(record) + "\n").encode()
    order.append(record_key)
    with zipfile.ZipFile(out_path, "w") as zout:
        for arcname in order:
            info = zipfile.ZipInfo(arcname, date_time=EPOCH)
            info.compress_type = zipfile.ZIP_DEFLATED
            info.external_attr = 0o644 << 16
            info.create_system = 3
            zout.writestr(info, members[arcname], compresslevel=9)


def python_tag():
    """The wheel python tag of this interpreter, e.g. ``cp314``."""
    return f"cp{sys.version_info.major}{sys.version_info.minor}"


def compile_wheel(in_path, out_dir, drop_prefixes=(), work_dir="/tmp/pyc-work"):
    """Byte-compile the wheel at ``in_path`` into ``out_dir``.

    Members whose path starts with one of ``drop_prefixes`` (e.g. a bundled
    test suite the site never imports) are left out. Returns the output file name (same distribution and version, python tag
    of this interpreter, ABI ``none``, platform ``any``).
    """
    name, version = os.path.basename(in_path).split("-")[:2]
    tag = f"{python_tag()}-none-any"
    out_name = f"{name}-{version}-{tag}.whl"
    shutil.rmtree(work_dir, ignore_errors=True)
    members = {}
    dist_info = None
    with zipfile.ZipFile(in_path) as zin:
        for info in zin.infolist():
            if info.is_dir():
                continue
            arcname = info.filename
            if any(arcname.startswith(p) for p in drop_prefixes):
                continue
            top = arcname.split("/", 1)[0]
            if top.endswith(".dist-info"):
                dist_info = top
            data = zin.read(info)
            if arcname.endswith(".py") and not top.endswith((".dist-info", ".data")):
                src = os.path.join(work_dir, arcname)
                os.makedirs(os.path.dirname(src), exist_ok=True)
                with open(src, "wb") as f:
                    f.write(data)
                pyc = src + "c"
                py_compile.compile(
                    src,
                    cfile=pyc,
                    dfile=arcname,
                    doraise=True,
                    invalidation_mode=py_compile.PycInvalidationMode.UNCHECKED_HASH,
                )
                with open(pyc, "rb") as f:
                    members[arcname + "c"] = f.read()
            else:
                members[arcname] = data
    if dist_info is None:
        raise ValueError(f"{in_path}: no .dist-info folder; not a wheel")

    wheel_key = f"{dist_info}/WHEEL"
    lines = [
        f"Tag: {tag}" if line.startswith("Tag:") else line
        for line in members[wheel_key].decode().splitlines()
    ]
    members[wheel_key] = ("\n".join(lines) + "\n").encode()

    os.makedirs(out_dir, exist_ok=True)
    write_wheel(os.path.join(out_dir, out_name), members, dist_info)
    shutil.rmtree(work_dir, ignore_errors=True)
    return out_name
