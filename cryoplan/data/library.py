"""The library of material files: the folders searched, the index of ids and aliases, and
the lookup of a material by id.

Material files live in three kinds of folder, searched in this order (a later folder
overrides an earlier one, material by material):

1. the bundled folder: ``cryoplan/materials`` in an installed package, or ``materials/``
   beside the package in a source checkout;
2. the user's folder: ``<platformdirs user data dir>/cryoplan/materials``;
3. each folder named in the environment variable ``CRYOPLAN_MATERIALS`` (several are
   separated by ``os.pathsep``).

Loading is lazy and cheap: the folders are indexed by a quick scan of each file's ``id``
and ``aliases`` lines; a file is read in full (:func:`~cryoplan.data.material_file.
read_material_file`) only when its material is asked for, or when the whole listing is.
A bad file becomes an :class:`~cryoplan.errors.InputError` in :func:`library_problems`,
and the other materials still load.
"""

from __future__ import annotations

import os
import re
from pathlib import Path

from ..errors import InputError, UnknownNameError
from ..resources import bundled as _bundled_folder
from .material import Material
from .material_file import read_material_file

#: The environment variable naming extra material folders.
ENV_VAR = "CRYOPLAN_MATERIALS"


def bundled_folder() -> Path | None:
    """The folder of the materials shipped with cryoplan (installed or source checkout)."""
    return _bundled_folder("materials")


def user_folder() -> Path:
    """The user's own material folder (platformdirs user data dir)."""
    import platformdirs

    return Path(platformdirs.user_data_dir("cryoplan", appauthor=False)) / "materials"


def search_folders() -> list[tuple[Path, bool, bool]]:
    """(folder, bundled?, from the environment?) in reading order; later ones override."""
    folders: list[tuple[Path, bool, bool]] = []
    bundled = bundled_folder()
    if bundled is not None:
        folders.append((bundled, True, False))
    folders.append((user_folder(), False, False))
    for part in os.environ.get(ENV_VAR, "").split(os.pathsep):
        if part.strip():
            folders.append((Path(part.strip()).expanduser(), False, True))
    return folders


_ID_LINE = re.compile(r"""^id\s*=\s*["']([^"']+)["']""", re.M)
_ALIAS_LINE = re.compile(r"""^aliases\s*=\s*\[([^\]]*)\]""", re.M)


class _Library:
    """An index of the material files (id and aliases read by a quick scan); each file
    is parsed and checked in full only when its material is asked for, or when the whole
    listing is (``material_ids``, ``library_problems``)."""

    def __init__(self) -> None:
        self.candidates: dict[str, list[tuple[Path, bool]]] = {}
        self.alias_of: dict[str, str] = {}
        self.unindexed: list[tuple[Path, bool]] = []
        self.problems: list[InputError] = []
        self.loaded: dict[str, Material | None] = {}
        self.complete = False
        for folder, bundled, from_env in search_folders():
            if not folder.is_dir():
                if from_env:
                    self.problems.append(
                        InputError(
                            f"the folder named in {ENV_VAR} does not exist", file=str(folder)
                        )
                    )
                continue
            seen: dict[str, Path] = {}
            for path in sorted(folder.glob("*.toml")):
                try:
                    text = path.read_text(encoding="utf-8")
                except OSError as exc:
                    self.problems.append(
                        InputError(f"cannot read the file ({exc.strerror})", file=str(path))
                    )
                    continue
                match = _ID_LINE.search(text)
                if not match:
                    self.unindexed.append((path, bundled))
                    continue
                mid = match.group(1).strip().lower()
                if mid in seen:
                    self.problems.append(
                        InputError(
                            f"material id {mid!r} is also defined in {seen[mid]}; this file is "
                            "ignored",
                            file=str(path),
                            key="id",
                        )
                    )
                    continue
                seen[mid] = path
                self.candidates.setdefault(mid, []).append((path, bundled))
                aliases = _ALIAS_LINE.search(text)
                if aliases:
                    for alias in re.findall(r"""["']([^"']+)["']""", aliases.group(1)):
                        self.alias_of[alias.strip().lower()] = mid
        for alias in list(self.alias_of):
            if alias in self.candidates:
                del self.alias_of[alias]

    def get(self, mid: str) -> Material | None:
        """The material of this canonical id, parsed on first use (None if it is bad)."""
        if mid in self.loaded:
            return self.loaded[mid]
        self.loaded[mid] = None  # guards against a mixture that contains itself
        found = None
        for path, bundled in reversed(self.candidates.get(mid, [])):
            try:
                material = read_material_file(path, bundled=bundled)
                if material.id != mid:
                    raise InputError(
                        "the id differs from the one first read",
                        file=str(path),
                        key="id",
                        found=repr(material.id),
                    )
                if material.model == "mixture":
                    self._resolve_mixture(material)
            except InputError as exc:
                self.problems.append(exc)
                continue  # a bad override: fall back to the file it overrides
            found = material
            break
        self.loaded[mid] = found
        return found

    def load_all(self) -> None:
        if self.complete:
            return
        for mid in list(self.candidates):
            self.get(mid)
        for path, bundled in self.unindexed:
            try:
                read_material_file(path, bundled=bundled)
            except InputError as exc:
                self.problems.append(exc)
            else:
                self.problems.append(
                    InputError(
                        "the id must be on a line of its own at the top of the file",
                        file=str(path),
                        key="id",
                        expected='id = "name"',
                        found="another layout",
                    )
                )
        self.complete = True

    @property
    def materials(self) -> dict[str, Material]:
        self.load_all()
        return {k: v for k, v in self.loaded.items() if v is not None}

    def _resolve_mixture(self, material: Material) -> None:
        comps = []
        breakpoints: list[float] = []
        for i, (mid, frac) in enumerate(material._params["components"]):
            key = mid.lower()
            part = self.get(self.alias_of.get(key, key))
            if part is None or part.model == "mixture":
                raise UnknownNameError(
                    "component material",
                    mid,
                    sorted(self.candidates),
                    file=material.origin,
                    key=f"heat_capacity.components[{i}].material",
                )
            if part.t_max < material.t_max * (1 - 1e-9):
                raise InputError(
                    f"component {mid!r} has data only to {part.t_max:g} K",
                    file=material.origin,
                    key="heat_capacity.range",
                    expected=f"a range within every component's (to {part.t_max:g} K)",
                    found=f"{material.t_max:g} K",
                )
            comps.append((part, frac))
            breakpoints.extend(part._breakpoints)
            for source in part.sources:
                if source not in material.sources:
                    material.sources.append(source)

        def c(t, comps=tuple(comps)):
            return sum(frac * part._c_raw(t) for part, frac in comps)

        material._c = c
        material._breakpoints = tuple(sorted(set(breakpoints)))
        material._params["parts"] = comps


_LIBRARY: _Library | None = None


def _library() -> _Library:
    global _LIBRARY
    if _LIBRARY is None:
        _LIBRARY = _Library()
    return _LIBRARY


def reload() -> None:
    """Forget the loaded materials; the next call reads the folders again."""
    global _LIBRARY
    _LIBRARY = None


def material_ids() -> list[str]:
    """Sorted canonical ids of every material that loaded (aliases not included).

    >>> "copper" in material_ids()
    True
    """
    return sorted(_library().materials)


def material(name: str) -> Material:
    """The material with this id or alias (case-insensitive).

    Raises
    ------
    UnknownNameError
        Naming the closest ids.

    >>> material("Aluminum-6061").id
    'aluminium-6061'
    """
    lib = _library()
    if not isinstance(name, str):
        raise InputError("a material id must be text", found=repr(name))
    key = name.strip().lower()
    key = lib.alias_of.get(key, key)
    found = lib.get(key) if key in lib.candidates else None
    if found is not None:
        return found
    if key in lib.candidates:
        bad = [str(p) for p in lib.problems if getattr(p, "file", None)]
        raise InputError(
            f"material {name!r} could not be loaded; its file has a problem",
            found="; ".join(bad[-1:]) or None,
        )
    raise UnknownNameError("material", name, sorted(lib.candidates) + sorted(lib.alias_of))


def material_origin(name: str) -> str:
    """Where a material came from: ``"bundled"`` or the path of the user's file."""
    m = material(name)
    return "bundled" if m.bundled else m.origin


def library_problems() -> list[InputError]:
    """The problems found in material files (each names file, key, expected, found)."""
    lib = _library()
    lib.load_all()
    return list(lib.problems)


def all_materials() -> list[Material]:
    """Every loaded material, sorted by id."""
    materials = _library().materials
    return [materials[k] for k in sorted(materials)]
