# Run inside Pyodide by stdlib_closure.mjs (beside this file), after the engine's packages
# are loaded the normal way: which members of Pyodide's python_stdlib.zip can
# the site ever import?
#
# Start from every module imported by then (Pyodide's own start, loading the
# packages, importing noblegap, building the unit registry, describing and
# running every calculator's example and every case of
# noblegap/cases.json, through noblegap.engine_hooks) and follow
# every import statement in their code, including those inside functions
# and those behind try/except, to a fixed point; string constants handed to
# importlib.import_module or __import__ count as imports too. The result is
# a superset of what any input can make the engine import, since an import
# not written in the code cannot happen without import_module on a computed
# name (the codecs, see EXTRA, and sysconfig's _sysconfigdata_*). Frozen
# modules (os, io, abc, codecs, site, ...) live in the runtime, not the zip.
#
# Prints one JSON object: {"members": [zip member names], "modules": N,
#                          "imported_at_start": N}
import dis
import importlib.util
import json
import pkgutil
import sys
import types
import zipfile

# The codecs Python looks up by name (codecs.lookup imports
# encodings.<name>): the Unicode ones and Latin-1, whatever else is
# imported already.
EXTRA = [
    "encodings.aliases", "encodings.ascii", "encodings.charmap", "encodings.cp1252", "encodings.idna",
    "encodings.latin_1", "encodings.punycode", "encodings.raw_unicode_escape", "encodings.unicode_escape",
    "encodings.utf_16", "encodings.utf_16_be", "encodings.utf_16_le", "encodings.utf_32",
    "encodings.utf_32_be", "encodings.utf_32_le", "encodings.utf_8", "encodings.utf_8_sig",
]

import noblegap.api as _api  # noqa: E402
import noblegap.engine_hooks as _hooks  # noqa: E402

_hooks.warm_up()
_hooks.after_restore()
for _case in _hooks.cases():
    json.dumps(_api.run(_case["calc"], _case["inputs"]))

STDLIB = next(p for p in sys.path if p.endswith(".zip"))
START = sorted(sys.modules)


def spec_of(name):
    try:
        return importlib.util.find_spec(name)
    except (ImportError, ValueError, AttributeError):
        return None


def code_of(spec, name):
    if spec is None or spec.loader is None or not hasattr(spec.loader, "get_code"):
        return None
    try:
        return spec.loader.get_code(name)
    except (ImportError, SyntaxError, OSError):
        return None


def imported_names(code, package):
    """Module names the code (and the code nested in it) may import."""
    names = []
    stack = [code]
    while stack:
        co = stack.pop()
        stack.extend(c for c in co.co_consts if isinstance(c, types.CodeType))
        ins = list(dis.get_instructions(co))
        for k, op in enumerate(ins):
            if op.opname != "IMPORT_NAME":
                continue
            # IMPORT_NAME pops (level, fromlist), pushed by the two loads before it
            args = [x.argval for x in ins[max(0, k - 2):k] if x.opname in ("LOAD_CONST", "LOAD_SMALL_INT")]
            level, fromlist = (args + [0, None])[:2] if len(args) == 2 else (0, None)
            name = op.argval
            if isinstance(level, int) and level > 0:
                parts = package.split(".")
                base = ".".join(parts[:len(parts) - level + 1]) if level <= len(parts) else ""
                name = f"{base}.{name}" if name else base
            if name:
                names.append(name)
                if isinstance(fromlist, tuple):
                    names += [f"{name}.{f}" for f in fromlist if f != "*"]
        if {"import_module", "__import__"} & set(co.co_names):
            names += [c for c in co.co_consts
                      if isinstance(c, str) and c and all(p.isidentifier() for p in c.split("."))]
    return names


# Every module of the engine package is a root too, imported at start or not:
# the worker may call any of them later (noblegap.schedule, noblegap.sheet and
# the optional packages they import lazily, such as segno for a sheet's QR code).
_pkg = importlib.import_module("noblegap")
ENGINE_MODULES = [m.name for m in pkgutil.walk_packages(_pkg.__path__, "noblegap.")]

seen = set()
todo = START + EXTRA + ENGINE_MODULES
while todo:
    name = todo.pop()
    if name in seen:
        continue
    seen.add(name)
    if "." in name:
        todo.append(name.rpartition(".")[0])
    spec = spec_of(name)
    code = code_of(spec, name)
    if code is None:
        continue
    package = name if spec.submodule_search_locations is not None else name.rpartition(".")[0]
    todo += [n for n in imported_names(code, package) if n not in seen]

members = set()
prefix = STDLIB + "/"
for name in seen:
    spec = spec_of(name)
    if spec is not None and spec.origin and spec.origin.startswith(prefix):
        members.add(spec.origin[len(prefix):])
with zipfile.ZipFile(STDLIB) as zf:
    listed = set(zf.namelist())
# sysconfig imports its data module by a computed name (platform and ABI)
members |= {name for name in listed if name.startswith("_sysconfigdata_") and name.endswith(".py")}
missing = members - listed
if missing:
    raise SystemExit(f"modules found in the zip but not listed in it: {sorted(missing)[:5]}")
print(json.dumps({"members": sorted(members), "modules": len(members),
                  "imported_at_start": sum(1 for n in START if (spec_of(n) or object) and
                                           getattr(spec_of(n), "origin", "") and
                                           spec_of(n).origin.startswith(prefix))}))
